/** Inputs larger than these are refused before they can exhaust memory (the limits). */
export const importLimits = {
  /** Bytes of a file on disk or an upload. */
  maxFileBytes: 100 * 1024 * 1024,
  /** Data rows of a table. */
  maxRows: 1_000_000,
  /** Bytes actually inflated from all the entries of an XLSX (zip) file. */
  maxInflatedBytes: 500 * 1024 * 1024,
  /** Inflated bytes per compressed byte of one zip entry, beyond `ratioFloorBytes`. */
  maxEntryRatio: 200,
  /** An entry may inflate this much whatever its ratio (small, highly repetitive XML is normal). */
  ratioFloorBytes: 4 * 1024 * 1024,
} as const;

export type ImportLimits = { -readonly [key in keyof typeof importLimits]: number };

export const megabytes = (bytes: number) => `${Math.round((bytes / 1024 / 1024) * 10) / 10} MB`;
