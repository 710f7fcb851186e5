/**
 * Seeded synthetic training logs: an exponential approach to the equilibrium values with
 * white noise, and planted faults (a periodic oscillation, a divergence, a collapse, a
 * discriminator that wins). Test helper only.
 *
 * @module
 */
import { rng } from "../lib/random/rng.ts";

/** What to plant in a synthetic log. */
export interface SyntheticLogOptions {
  /** Records (default 400). */
  n?: number;
  /** Steps between records (default 10). */
  stepSize?: number;
  /** Seed of the noise. */
  seed: number;
  /** Noise sd of the losses (default 0.05); D outputs get 0.4 of it. */
  noise?: number;
  /** Period in records of an oscillation added to the losses and D outputs. */
  period?: number;
  /** Amplitude of the oscillation of the losses (default 0.15; D outputs 0.3 of it). */
  amplitude?: number;
  /** Record where the oscillation starts (default 0). */
  oscillationFrom?: number;
  /** Record where the losses start to grow exponentially (time constant 15 records). */
  divergeAt?: number;
  /** Record where D suddenly wins: D loss drops to 0.3, D(fake) to 0.08, G loss jumps. */
  collapseAt?: number;
}

const LN2 = Math.LN2;

/** Columns { step, d_loss, g_loss, d_real, d_fake } of a synthetic log. */
export function syntheticLog(o: SyntheticLogOptions): Record<string, number[]> {
  const n = o.n ?? 400, dt = o.stepSize ?? 10, s = o.noise ?? 0.05, tau = n / 6;
  const r = rng(o.seed);
  const cols: Record<string, number[]> = {
    step: [],
    d_loss: [],
    g_loss: [],
    d_real: [],
    d_fake: [],
  };
  for (let i = 0; i < n; i++) {
    const decay = Math.exp(-i / tau);
    const wave = o.period && i >= (o.oscillationFrom ?? 0)
      ? Math.sin((2 * Math.PI * i) / o.period) * (o.amplitude ?? 0.15)
      : 0;
    let dLoss = 2 * LN2 - 0.6 * decay + wave, gLoss = LN2 + 1.2 * decay - wave;
    let dReal = 0.5 + 0.3 * decay + 0.3 * wave, dFake = 0.5 - 0.3 * decay - 0.3 * wave;
    if (o.divergeAt !== undefined && i >= o.divergeAt) {
      const g = Math.exp((i - o.divergeAt) / 15) - 1;
      dLoss += g;
      gLoss += 2 * g;
    }
    if (o.collapseAt !== undefined && i >= o.collapseAt) {
      dLoss = 0.3;
      gLoss = 2.5;
      dReal = 0.9;
      dFake = 0.08;
    }
    cols.step.push(i * dt);
    cols.d_loss.push(dLoss + s * r.normal());
    cols.g_loss.push(gLoss + s * r.normal());
    cols.d_real.push(dReal + 0.4 * s * r.normal());
    cols.d_fake.push(dFake + 0.4 * s * r.normal());
  }
  return cols;
}
