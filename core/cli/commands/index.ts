import type { CliCommand } from '../command.ts';
import { footprintCommand } from './footprint.ts';
import { hazardCommand } from './hazard.ts';
import { studyCommand } from './study.ts';
import { trajectoryCommand } from './trajectory.ts';
import { verifyCommand } from './verify.ts';

/** Every sub-command, in the order `landreach --help` lists them. Add new commands here. */
export const COMMANDS: readonly CliCommand[] = [trajectoryCommand, footprintCommand, studyCommand, hazardCommand, verifyCommand];
