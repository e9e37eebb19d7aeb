import { SpeedbandError } from '../core/errors.js';
import { HEADING_LOOP } from './heading.js';
import { PATH_LOOP } from './path.js';
import type { LoopDefinition, LoopKind } from './types.js';
import { YAW_RATE_LOOP } from './yaw-rate.js';

/** Every loop the firmware may close. A new loop is one file plus one line here (DEVELOPERS.md "How to add a loop"). */
export const LOOPS: readonly LoopDefinition[] = [YAW_RATE_LOOP, HEADING_LOOP, PATH_LOOP];

export const LOOP_KINDS: readonly LoopKind[] = LOOPS.map((loop) => loop.kind);

/** The loop definition of `kind`, or `loops.unknownKind` listing the known kinds. */
export function findLoop(kind: string): LoopDefinition {
  const loop = LOOPS.find((candidate) => candidate.kind === kind);
  if (loop !== undefined) return loop;
  throw new SpeedbandError('loops.unknownKind', `unknown loop "${kind}"; expected one of ${LOOP_KINDS.join(', ')}`, {
    details: { kind, known: LOOP_KINDS },
  });
}
