/**
 * A picked target's trajectory as the UI tracks it: being solved, solved, or failed with a message. A solved
 * one keeps what it was solved from (the inputs' key, its budget and net thrust): whether it is stale is
 * derived from the key (renderer/state/derive.ts), and its figures never borrow the inputs now.
 */
import type { PickedTrajectory } from '../../core/footprint/pickedTrajectory.ts';

export type PickState =
  | { id: number; status: 'solving' }
  | { id: number; status: 'done'; result: PickedTrajectory; inputsKey: string; budget_kg: number; thrustMax_N: number }
  | { id: number; status: 'error'; message: string };
