/**
 * What a model was built from (registry id and options, or formula text), remembered beside the
 * model object so a fit can record it and later steps can rebuild exactly the same model.
 */
import type { Model, ParameterSpec } from "./model.js";

/** A formula model's text: expression, position variable and parameter specs (SI). */
export interface FormulaSource {
  expression: string;
  variable: string;
  parameters: ParameterSpec[];
}

/** How to rebuild a model: a registry id with its options, or a formula. */
export interface ModelSource {
  /** Model id (registry id, or the formula model's id, default "formula"). */
  id: string;
  /** Options passed to getModel (empty for formula models). */
  options: Record<string, unknown>;
  /** Present for formula models: what formulaModel was given. */
  formula?: FormulaSource;
  /** True for a hand-built model (not from getModel or formulaModel): recorded by id only, not rebuildable. */
  custom?: boolean;
}

// A WeakMap keeps Model objects untouched (they are shared, some are frozen) and forgets with them.
const SOURCES = new WeakMap<Model, ModelSource>();

/** Records how `model` was built (called by getModel and formulaModel). Returns the model. */
export function rememberModelSource<M extends Model>(model: M, source: ModelSource): M {
  SOURCES.set(model, source);
  return model;
}

/**
 * How `model` was built, or a source naming only its id when it was not built by getModel or
 * formulaModel (a hand-written model cannot be rebuilt from a results file).
 */
export function modelSource(model: Model): ModelSource & { rebuildable: boolean } {
  const known = SOURCES.get(model);
  return known ? { ...known, rebuildable: true } : { id: model.id, options: {}, rebuildable: false };
}
