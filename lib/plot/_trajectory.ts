/**
 * Reading two coordinates of a simulated trajectory for figures.
 *
 * @module
 */
import type { Simulation } from "../game/simulate_training.ts";

/** The path of stacked coordinates `a` and `b` ([θ…, φ…] order) of a simulation. */
export function trajectoryPath(sim: Simulation, a: number, b: number): { x: number; y: number }[] {
  const tr = sim.trajectory, n = tr.length;
  const p = tr.theta.length / n, q = tr.phi.length / n;
  const at = (t: number, s: number) => (s < p ? tr.theta[t * p + s] : tr.phi[t * q + s - p]);
  return Array.from({ length: n }, (_, t) => ({ x: at(t, a), y: at(t, b) }));
}
