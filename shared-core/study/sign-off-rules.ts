import type { SignOff, SignOffMeaning } from './revision-schema.js';

/** The meanings in the order a revision gathers them (DESIGN.md, "The record"). */
export const meaningOrder: readonly SignOffMeaning[] = ['prepared', 'reviewed', 'approved'];

export interface SignOffRule {
  /** The meanings the site requires, e.g. only approved, or all three. */
  required: readonly SignOffMeaning[];
  /** Different people for each meaning, told apart by key fingerprint. */
  separatePeople: boolean;
}

/**
 * Why a new sign-off may not be added, or null when it may: each meaning once, in order (every
 * required meaning before this one must be there already), and a different key and printed name
 * for each meaning when the site requires separate people.
 */
export function signOffRefusal(
  rule: SignOffRule,
  earlier: readonly Pick<SignOff, 'meaning' | 'fingerprint' | 'printedName'>[],
  next: { meaning: SignOffMeaning; fingerprint: string; printedName?: string },
): string | null {
  if (earlier.some((s) => s.meaning === next.meaning)) {
    return `this revision already has a "${next.meaning}" sign-off`;
  }
  const position = meaningOrder.indexOf(next.meaning);
  const missing = meaningOrder
    .slice(0, position)
    .filter((meaning) => rule.required.includes(meaning) && !earlier.some((s) => s.meaning === meaning));
  if (missing.length > 0) {
    return `a "${next.meaning}" sign-off needs the ${missing.map((m) => `"${m}"`).join(' and ')} sign-off first`;
  }
  const sameKey = earlier.find((s) => s.fingerprint === next.fingerprint);
  if (rule.separatePeople && sameKey) {
    return `this key already signed as "${sameKey.meaning}" (${sameKey.printedName}); the site requires a different person for each meaning`;
  }
  // A second key does not make a second person: the printed name is compared too.
  const name = next.printedName?.trim().toLowerCase();
  const sameName = name ? earlier.find((s) => s.printedName.trim().toLowerCase() === name) : undefined;
  if (rule.separatePeople && sameName) {
    return `${sameName.printedName} already signed this revision as "${sameName.meaning}"; the site requires a different person for each meaning`;
  }
  return null;
}

/** Required meanings not yet signed, in order. */
export function missingMeanings(
  rule: SignOffRule,
  signOffs: readonly Pick<SignOff, 'meaning'>[],
): SignOffMeaning[] {
  return meaningOrder.filter((m) => rule.required.includes(m) && !signOffs.some((s) => s.meaning === m));
}
