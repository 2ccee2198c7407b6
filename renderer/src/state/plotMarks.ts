/**
 * The plots' "Mark CLmax" and "Show fitted lines" choices, shared by the plots on screen and the
 * exported figures (so what is drawn on screen is what is exported), and remembered in the page's
 * local storage across reloads, like the first-start flag: a display preference, not campaign data.
 */
import { reactive, watch } from 'vue';
import type { MarkChoice } from '../logic/plotMarks.ts';

export const MARKS_STORAGE_KEY = 'sweepbook.plotMarks';

type Store = Pick<Storage, 'getItem' | 'setItem'>;

function storageOrNull(): Store | null {
  try {
    return typeof localStorage === 'undefined' ? null : localStorage;
  } catch {
    return null; // storage refused (a sandboxed page): the choice lasts for the session only
  }
}

/** The choice as stored, or both off when nothing (or something unreadable) is stored. */
export function readChoice(store: Store | null): MarkChoice {
  try {
    const v = JSON.parse(store?.getItem(MARKS_STORAGE_KEY) ?? 'null') as Partial<MarkChoice> | null;
    return { clMax: v?.clMax === true, fitLines: v?.fitLines === true };
  } catch {
    return { clMax: false, fitLines: false };
  }
}

export function createPlotMarks(store: Store | null = storageOrNull()): MarkChoice {
  const choice = reactive<MarkChoice>(readChoice(store));
  watch(
    () => ({ clMax: choice.clMax, fitLines: choice.fitLines }),
    (v) => {
      try {
        store?.setItem(MARKS_STORAGE_KEY, JSON.stringify(v));
      } catch {
        // full or refused storage: the choice still holds for this session
      }
    },
  );
  return choice;
}

/** The one choice of the window. */
export const plotMarks: MarkChoice = createPlotMarks();
