/**
 * The metadata a setup field carries beside its validation (`.meta({...})` in core/setup/schema.ts),
 * typed by augmenting zod's global metadata. From it come the window's setup form, docs/setup.md and
 * docs/setup.schema.json; see DEVELOPERS.md, "Adding a setup field".
 */
import 'zod';

/** How the window's form edits a field when the schema's type alone does not say it. */
export type SetupFormKind = 'number' | 'auto-number' | 'choice' | 'flag' | 'text';

/** The keys a setup field's `.meta()` may carry besides JSON Schema's own (title, description, ...). */
export interface SetupFieldMeta {
  /** Short name, as the window's form and the docs show it ("Reference chord c"). */
  label?: string;
  /** Unit as people write it ('m', 'm²', 'Pa', '°C', '–' for a dimensionless number); the value is SI. */
  unit?: string;
  /** One line beside the form field (and in the docs). */
  help?: string;
  /** Further explanation for the docs only. */
  details?: string;
  /** Labels of an enum's values, in the order the form offers them. */
  choices?: Record<string, string>;
  /** The default in words, when it depends on other fields (and so is not a zod `.default`). */
  defaultText?: string;
  /** How the form edits the field; 'auto-number' sends null for an empty box (computed by the engine). */
  formKind?: SetupFormKind;
  /** false: not shown in the window's form (the docs still list it). */
  form?: boolean;
  /** On a block (an object): its heading in the form and the docs. */
  group?: string;
}

declare module 'zod' {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type -- merges our keys into zod's metadata type
  interface GlobalMeta extends SetupFieldMeta {}
}
