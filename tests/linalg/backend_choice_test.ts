/**
 * How the backend is chosen, in fresh processes: without FFI permission, with
 * SADDLEKIT_BLAS=off, and with a SADDLEKIT_BLAS path that does not load, saddlekit falls
 * back to TypeScript with no prompt and no error, and says why.
 */
import assert from "node:assert/strict";

const probe = new URL("./_backend_probe.ts", import.meta.url).pathname;
const root = new URL("../../", import.meta.url).pathname;

async function choose(permissions: string[], env: Record<string, string>) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "--no-prompt", ...permissions, probe],
    cwd: root,
    // Empty unless the case sets it: the child would otherwise inherit this run's
    // SADDLEKIT_BLAS (CI reruns these tests with SADDLEKIT_BLAS=off).
    env: { SADDLEKIT_BLAS: "", ...env, NO_COLOR: "1" },
    stdout: "piped",
    stderr: "piped",
  }).output();
  const stderr = new TextDecoder().decode(out.stderr);
  assert.equal(out.code, 0, stderr);
  assert.equal(stderr.trim(), "", "no warning and no prompt");
  return JSON.parse(new TextDecoder().decode(out.stdout)) as { name: string; reason: string };
}

Deno.test("linalg backend: no FFI permission means TypeScript, without a prompt", async () => {
  const b = await choose(["--allow-read", "--allow-env"], {});
  assert.equal(b.name, "typescript");
  assert.match(b.reason, /FFI permission/);
});

Deno.test("linalg backend: SADDLEKIT_BLAS=off forces TypeScript", async () => {
  const b = await choose(["-A"], { SADDLEKIT_BLAS: "off" });
  assert.deepEqual(b, {
    name: "typescript",
    reason: "SADDLEKIT_BLAS=off forces the TypeScript kernels",
  });
});

Deno.test("linalg backend: a SADDLEKIT_BLAS path that does not load falls back to TypeScript", async () => {
  const b = await choose(["-A"], { SADDLEKIT_BLAS: "/nonexistent/libopenblas.so.0" });
  assert.equal(b.name, "typescript");
  assert.match(b.reason, /SADDLEKIT_BLAS=\/nonexistent\/libopenblas\.so\.0 could not be loaded/);
});
