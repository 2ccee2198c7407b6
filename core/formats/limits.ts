/**
 * Size limits for the small documents the engine reads whole. A setup is a few kilobytes and a
 * campaign of ten thousand runs a few megabytes; anything far larger is not what it claims to be, and
 * reading it whole (into memory, into every export's provenance) would hurt. Run files have no limit:
 * they are streamed.
 */

/** A setup file above this is refused (1 MiB; the sample setups are about 1 kB). */
export const SETUP_MAX_BYTES = 1 << 20;

/** A campaign file above this is refused (64 MiB: room for tens of thousands of runs with their setups). */
export const CAMPAIGN_MAX_BYTES = 64 << 20;

/** A run or tare file a campaign names is opened only up to this size (4 GiB; a million-point run is about 30 MB). */
export const CAMPAIGN_RUN_MAX_BYTES = 4 * 1024 ** 3;

/** A campaign names at most this many runs and tares. */
export const CAMPAIGN_MAX_FILES = 100_000;

const mib = (bytes: number) => `${(bytes / (1 << 20)).toFixed(bytes < 1 << 20 ? 2 : 1)} MiB`;

export function setupTooLarge(bytes: number): string {
  return `a setup file is at most ${mib(SETUP_MAX_BYTES)}, this one is ${mib(bytes)}; is it the right file?`;
}

export function campaignTooLarge(bytes: number): string {
  return `a campaign file is at most ${mib(CAMPAIGN_MAX_BYTES)}, this one is ${mib(bytes)}; is it the right file?`;
}
