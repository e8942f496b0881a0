/** Auth constants shared by the server and the pages: link lifetimes, guess pacing. */
export const RESET_LINK_MINUTES = 30;
export const INVITATION_DAYS = 7;

/** Password guesses answered at once before each further one is slowed down. */
export const UNSLOWED_GUESSES = 2;

/**
 * The pause before judging the rank-th guess in a row: none for the first
 * two, then 0.25 s, 0.5 s, 1 s…, so a person who mistypes is not slowed but
 * a guesser's last guesses before refusal cost time.
 */
export function slowDownMs(rank: number): number {
  return rank <= UNSLOWED_GUESSES
    ? 0
    : 250 * 2 ** (rank - UNSLOWED_GUESSES - 1);
}
