/**
 * What an archived scenario refuses until it is restored, in the words both the server's 409 and
 * the app's library show, so the two cannot drift. Each phrase finishes "restore it before …".
 */
export const ARCHIVED_REFUSES = {
  run: 'running it',
  comment: 'commenting on it',
  handOff: 'handing it off',
  signOff: 'signing off',
  attachLog: 'attaching a log to it',
} as const;

export type ArchivedRefusal = keyof typeof ARCHIVED_REFUSES;

/**
 * The sentence for acting on an archived scenario.
 * @example archivedScenarioMessage('running it') // 'This scenario is archived; restore it before running it.'
 */
export function archivedScenarioMessage(doing: string): string {
  return `This scenario is archived; restore it before ${doing}.`;
}

/** The library's explanation of an archived scenario: everything it refuses, in one sentence. */
export const ARCHIVED_SCENARIO_NOTE = archivedScenarioMessage(
  `${ARCHIVED_REFUSES.run}, ${ARCHIVED_REFUSES.comment} or ${ARCHIVED_REFUSES.handOff}`,
);
