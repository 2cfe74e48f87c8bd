/** The mechanism families the workspace offers, in the trade's words. */
import { FAMILY_NAMES, type FamilyId } from '../../core/synthesis';

export type { FamilyId };

export interface FamilyChoice {
  readonly id: FamilyId;
  readonly label: string;
  /** What it is, in a few words, for the settings list. */
  readonly note: string;
}

export const FAMILY_CHOICES: readonly FamilyChoice[] = [
  { id: 'fourbar', label: FAMILY_NAMES.fourbar, note: 'crank, coupler and rocker; the coupler carries the point' },
  { id: 'slider-crank', label: FAMILY_NAMES['slider-crank'], note: 'crank and connecting rod; the rod carries the point' },
  { id: 'watt-i', label: FAMILY_NAMES['watt-i'], note: 'two four-bar loops sharing a ternary link' },
  { id: 'watt-ii', label: FAMILY_NAMES['watt-ii'], note: 'two four-bar loops in series' },
  { id: 'stephenson-i', label: FAMILY_NAMES['stephenson-i'], note: 'ternary links not joined, the frame joins both; point on a binary link' },
  { id: 'stephenson-ii', label: FAMILY_NAMES['stephenson-ii'], note: 'ternary crank; point on the floating ternary link' },
  { id: 'stephenson-iii', label: FAMILY_NAMES['stephenson-iii'], note: 'ternary frame; point on the floating ternary link' },
];

export function familyLabel(id: FamilyId): string {
  return FAMILY_CHOICES.find((f) => f.id === id)?.label ?? id;
}
