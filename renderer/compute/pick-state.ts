/** A picked target's trajectory as the UI tracks it: being solved, solved, or failed with a message. */
import type { PickedTrajectory } from '../../core/footprint/pickedTrajectory.ts';

export type PickState =
  | { id: number; status: 'solving' }
  | { id: number; status: 'done'; result: PickedTrajectory }
  | { id: number; status: 'error'; message: string };
