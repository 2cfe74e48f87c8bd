/** The mechanism families the workspace offers, in the trade's words. */
import type { FamilyId } from '../../core/synthesis';

export type { FamilyId };

export interface FamilyChoice {
  readonly id: FamilyId;
  readonly label: string;
  /** What it is, in a few words, for the settings list. */
  readonly note: string;
}

export const FAMILY_CHOICES: readonly FamilyChoice[] = [
  { id: 'fourbar', label: 'four-bar', note: 'crank, coupler and rocker; the coupler carries the point' },
  { id: 'slider-crank', label: 'slider-crank', note: 'crank and connecting rod; the rod carries the point' },
  { id: 'watt-i', label: 'Watt I six-bar', note: 'two four-bar loops sharing a ternary link' },
  { id: 'watt-ii', label: 'Watt II six-bar', note: 'two four-bar loops in series' },
  { id: 'stephenson-i', label: 'Stephenson I six-bar', note: 'ternary links not joined; point on a ternary link' },
  { id: 'stephenson-ii', label: 'Stephenson II six-bar', note: 'point on a binary link of the second loop' },
  { id: 'stephenson-iii', label: 'Stephenson III six-bar', note: 'point on a binary link, driven from a ternary' },
];

export function familyLabel(id: FamilyId): string {
  return FAMILY_CHOICES.find((f) => f.id === id)?.label ?? id;
}
