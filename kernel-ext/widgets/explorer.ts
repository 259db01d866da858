/**
 * Kernel side of the profile explorer: sends the profile as binary arrays, keeps the parameter
 * state the browser edits, fits on the browser's "fit" request (progress, cancel) and hands the
 * result to cell code as `explorer.result`.
 */
import { Fit } from "../../src/api/fit.js";
import { InvalidArgumentError } from "../../src/errors.js";
import { autoStartCandidates, supportsAutoStart } from "../../src/fit/autoStart.js";
import { describeFit } from "../../src/fit/fitSource.js";
import { resolveFitOptions } from "../../src/fit/optionQuantities.js";
import { fitJson } from "../../src/report/results/fitJson.js";
import type { FitOptions, NoiseModelId } from "../../src/fit/types.js";
import { getModel, listModels, type ModelOptions } from "../../src/physics/index.js";
import type { Model } from "../../src/physics/model.js";
import { modelSource } from "../../src/physics/modelSource.js";
import type { Profile } from "../../src/profile.js";
import { effectiveMask, keepCurveHeight, paramsForModel, paramVector, type ParamState } from "../../widgets/shared/preview.js";
import { display, MIME_BUNDLE, type MimeBundle } from "../display.js";
import { WidgetModel } from "../widget/model.js";
import { typedArraySerializer, type TypedArray } from "../widget/serializers.js";
import { fitOptionsFromParams } from "../../widgets/shared/fitRequest.js";
import { progressFraction } from "../../widgets/shared/state.js";
import { explorerFallback } from "./fallback.js";
import { startFit, type RunningFit } from "./fitRunner.js";
import { widgetIdentity } from "./identity.js";

/** Synchronised state (names as the browser model has them). */
export interface ExplorerState extends Record<string, unknown> {
  title: string;
  x: TypedArray | null;
  y: TypedArray | null;
  sigma: TypedArray | null;
  mask: TypedArray | null;
  counts: boolean;
  y_unit: string;
  model_id: string;
  /** getModel options of the model shown (JSON), so the browser previews and fits the same model. */
  model_options: Record<string, unknown>;
  model_choices: string[];
  params: Record<string, ParamState>;
  noise: string;
  window: [number, number] | null;
  masked_ranges: [number, number][];
  fit_state: "idle" | "running" | "done" | "failed" | "cancelled";
  fit_progress: number;
  fit_message: string;
  result: unknown;
  fit_curve: TypedArray | null;
}

/** Options of `explorer()`. */
export interface ExplorerOptions {
  /** Model id from the registry (default "two-slit") or a built model (getModel, formulaModel). */
  model?: string | Model;
  /** Options for getModel when `model` is an id (e.g. { smallAngle: true }); kept when the user switches models. */
  modelOptions?: ModelOptions;
  /**
   * Starting slider values by name, as in fitProfile: SI numbers or text with units ("680 nm");
   * others from the automatic start or the model defaults.
   */
  start?: FitOptions["start"];
  /**
   * Held parameters, as in fitProfile: name → value (SI number or text with units), or names
   * held at their start value (in addition to the model's fixed-by-default ones).
   */
  fix?: FitOptions["fix"];
  /** @deprecated older spelling of `fix` as a list of names; use `fix`. */
  fixed?: string[];
  /** Noise model (default "auto"). */
  noise?: NoiseModelId | "auto";
  /** Heading shown above the plot. */
  title?: string;
}

/**
 * Detector models the browser can build by id alone (models needing data, e.g. a spectrum, are
 * left out): the explorer's model menu, `current` first when it is not one of them.
 * @param current id of the model shown
 */
export function browserModelIds(current: string): string[] {
  const ids = listModels().filter((m) => m.axis === "detector").map((m) => m.id).filter((id) => {
    try {
      getModel(id);
      return true;
    } catch {
      return false;
    }
  });
  return ids.includes(current) ? ids : [current, ...ids];
}

/**
 * The profile explorer. Show it as a cell's last value or with `display()`; after the user
 * presses Fit (or cell code calls `fit()`), `result` holds the FitResult.
 */
export class Explorer {
  readonly widget: WidgetModel<ExplorerState>;
  readonly profile: Profile;
  private model: Model;
  /** The model the explorer was opened with (switching back returns to it, formula models included). */
  private readonly original: Model;
  /** Model options (smallAngle, quadrature nodes) kept across model switches. */
  private readonly modelOptions: ModelOptions;
  private latest: Fit | null = null;
  /** Slider state before the latest change (a model switch arrives with the new model's defaults already in). */
  private shown: Record<string, ParamState> = {};
  private running: RunningFit | null = null;

  constructor(profile: Profile, options: ExplorerOptions = {}) {
    if (!(profile?.x instanceof Float64Array) || !(profile.y instanceof Float64Array) || profile.x.length !== profile.y.length || profile.x.length < 2) {
      throw new InvalidArgumentError("profile", profile?.x?.length, "a Profile with Float64Array x and y of the same length ≥ 2 (positions in m)");
    }
    this.profile = profile;
    if (typeof options.model === "object" && options.modelOptions) {
      throw new InvalidArgumentError("modelOptions", options.modelOptions, "only with a model id; a model object already carries its options");
    }
    this.model = typeof options.model === "object" ? options.model : getModel(options.model ?? "two-slit", options.modelOptions ?? {});
    this.original = this.model;
    this.modelOptions = { ...(modelSource(this.model).options as ModelOptions) };
    // The same option shape as fitProfile: quantities with units are read by the fitter's own resolver.
    const resolved = resolveFitOptions(this.model, { start: options.start, fix: options.fix });
    const fix = resolved.fix ?? [];
    const fixValues: Record<string, number> = Array.isArray(fix) ? {} : { ...fix };
    const fixNames = [...(Array.isArray(fix) ? fix : Object.keys(fix)), ...(options.fixed ?? [])];
    const given = { ...(resolved.start ?? {}), ...fixValues };
    const params = paramsForModel(this.model);
    for (const name of [...Object.keys(given), ...fixNames]) {
      if (!params[name]) throw new InvalidArgumentError(name in given ? "start" : "fix", name, `a parameter of model ${this.model.id}: ${Object.keys(params).join(", ")}`);
    }
    const start = { ...this.autoStart(this.model, given), ...given };
    for (const [name, value] of Object.entries(start)) params[name].value = value;
    for (const name of fixNames) params[name].fixed = true;
    this.widget = new WidgetModel<ExplorerState>(widgetIdentity("Explorer"), {
      title: options.title ?? "Profile explorer",
      x: profile.x, y: profile.y, sigma: profile.sigma ?? null, mask: profile.mask ?? null,
      counts: profile.counts, y_unit: profile.yUnit,
      model_id: this.model.id,
      model_options: this.modelOptions,
      model_choices: browserModelIds(this.model.id),
      params, noise: options.noise ?? "auto", window: null, masked_ranges: [],
      fit_state: "idle", fit_progress: 0, fit_message: "", result: null, fit_curve: null,
    }, { serializers: { x: typedArraySerializer, y: typedArraySerializer, sigma: typedArraySerializer, mask: typedArraySerializer, fit_curve: typedArraySerializer } });
    this.widget.onChange((changes, source) => {
      if (source === "frontend" && typeof changes.model_id === "string" && changes.model_id !== this.model.id) {
        this.switchModel(changes.model_id, this.shown);
      }
      this.shown = structuredClone(this.widget.get("params"));
    });
    this.shown = structuredClone(params);
    this.widget.onCustom((content) => {
      const action = (content as { action?: string } | null)?.action;
      if (action === "fit") void this.fit().catch(() => undefined);
      else if (action === "cancel") this.cancel();
    });
  }

  /** The latest fit (null before the first), in SI; the same object the widget shows. */
  get result(): Fit | null {
    return this.latest;
  }

  /** Current parameter values (SI) as the sliders hold them. */
  get params(): Record<string, number> {
    return Object.fromEntries(Object.entries(this.widget.get("params")).map(([name, p]) => [name, p.value]));
  }

  /** The fit options the current widget state stands for (start, fixed, freed, bounds, noise, mask). */
  fitRequest(): { profile: Profile; options: Omit<FitOptions, "onProgress" | "signal"> } {
    const state = this.widget.getState();
    const mask = effectiveMask(this.profile.x, this.profile.mask ?? null, state.window, state.masked_ranges);
    return { profile: { ...this.profile, mask }, options: fitOptionsFromParams(this.model, state.params, state.noise) };
  }

  /**
   * Fit the free parameters from the current slider values (what the Fit button does).
   * The widget shows progress; the promise resolves with the result (also in `result`).
   */
  async fit(): Promise<Fit> {
    if (this.running) throw new InvalidArgumentError("fit", "a fit is already running", "wait for it or cancel() it first");
    const { profile, options } = this.fitRequest();
    this.widget.set({ fit_state: "running", fit_progress: 0, fit_message: "fitting…" });
    try {
      this.running = startFit(profile, this.model, options, (p) => {
        this.widget.set({ fit_progress: progressFraction(p.iteration), fit_message: `iteration ${p.iteration}, objective ${p.objective.toPrecision(7)}` });
      });
      const model = this.model;
      const result = new Fit({ ...(await this.running.result), source: describeFit(profile, model, options) }, profile, model);
      this.latest = result;
      const params = { ...this.widget.get("params") };
      for (const p of result.parameters) params[p.name] = { ...params[p.name]!, value: p.value };
      this.widget.set({
        result: fitJson(result), fit_curve: result.model, params,
        fit_state: result.reason === "cancelled" ? "cancelled" : "done", fit_progress: 1,
        fit_message: result.reason === "cancelled" ? "fit cancelled; showing where it stopped" : result.message,
      });
      return result;
    } catch (error) {
      this.widget.set({ fit_state: "failed", fit_progress: 0, fit_message: error instanceof Error ? error.message : String(error) });
      throw error;
    } finally {
      this.running = null;
    }
  }

  /** Stop a running fit at its next iteration (what the Cancel button does). */
  cancel(): void {
    this.running?.cancel();
  }

  /** Display bundle: the widget view plus text/plain and text/html for frontends without widgets. */
  [MIME_BUNDLE](): MimeBundle {
    return { ...this.widget.viewBundle(), ...explorerFallback(this.profile, this.model.id, this.latest) };
  }

  /** Show the explorer in the current cell's output. */
  display(): void {
    display(this);
  }

  /** Close the widget (its views disappear); a running fit is cancelled. */
  close(): void {
    this.cancel();
    this.widget.close();
  }

  /**
   * Automatic starting values of `model`'s own parameters (a two-slit-like start names some a
   * model may lack, e.g. visibility for n-slit); wavelength and distance come from `given` when set.
   */
  private autoStart(model: Model, given: Record<string, number>): Record<string, number> {
    if (!supportsAutoStart(model)) return {};
    const value = (name: string) => given[name] ?? model.parameters.find((p) => p.name === name)!.default;
    const smallAngle = this.modelOptions.smallAngle === true;
    const [first] = autoStartCandidates(this.profile.x, this.profile.y, value("wavelength"), value("distance"), smallAngle);
    const names = new Set(model.parameters.map((p) => p.name));
    return Object.fromEntries(Object.entries(first ?? {}).filter(([name]) => names.has(name)));
  }

  /**
   * The user picked another model: build it with the same model options, start its new
   * parameters from the data, keep the shared ones, and keep the curve's height.
   */
  private switchModel(id: string, previous: Record<string, ParamState>): void {
    const previousModel = this.model;
    this.model = id === this.original.id ? this.original : getModel(id, this.modelOptions);
    const next = paramsForModel(this.model, previous);
    const kept = Object.fromEntries(Object.entries(previous).filter(([name]) => next[name] !== undefined).map(([name, p]) => [name, p.value]));
    for (const [name, value] of Object.entries(this.autoStart(this.model, kept))) {
      if (previous[name] === undefined) next[name] = { ...next[name]!, value };
    }
    keepCurveHeight(this.profile.x, previousModel, paramVector(previousModel, previous, new Float64Array(previousModel.parameters.length)), this.model, next);
    this.widget.set({ params: next, result: null, fit_curve: null, fit_state: "idle", fit_message: "" });
  }
}

/**
 * Open a profile explorer on `profile` (positions in m).
 * @example const ex = explorer(profile, { model: "two-slit" }); ex   // then press Fit; ex.result
 */
export function explorer(profile: Profile, options: ExplorerOptions = {}): Explorer {
  return new Explorer(profile, options);
}
