/**
 * Kernel side of the profile explorer: sends the profile as binary arrays, keeps the parameter
 * state the browser edits, fits on the browser's "fit" request (progress, cancel) and hands the
 * result to cell code as `explorer.result`.
 */
import { InvalidArgumentError } from "../../src/errors.js";
import { autoStartCandidates, supportsAutoStart } from "../../src/fit/autoStart.js";
import type { FitOptions, FitResult, NoiseModelId } from "../../src/fit/types.js";
import { getModel, listModels } from "../../src/physics/index.js";
import type { Model } from "../../src/physics/model.js";
import type { Profile } from "../../src/profile.js";
import { effectiveMask, paramsForModel, type ParamState } from "../../widgets/src/preview.js";
import { display, MIME_BUNDLE, type MimeBundle } from "../display.js";
import { WidgetModel } from "../widget/model.js";
import { typedArraySerializer, type TypedArray } from "../widget/serializers.js";
import { fitOptionsFromParams } from "../../widgets/src/fitRequest.js";
import { explorerFallback } from "./fallback.js";
import { fitSummary } from "./fitSummary.js";
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
  /** Model id from the registry (default "two-slit") or a built model. */
  model?: string | Model;
  /** Starting slider values (SI) by name; others from the automatic start or the model defaults. */
  start?: Record<string, number>;
  /** Names held fixed (in addition to the model's fixed-by-default ones). */
  fixed?: string[];
  /** Noise model (default "auto"). */
  noise?: NoiseModelId | "auto";
  /** Heading shown above the plot. */
  title?: string;
}

/** Detector models the browser can build by id alone (models needing data, e.g. a spectrum, are left out). */
function browserModelIds(current: string): string[] {
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

/** Solver progress mapped to 0…1 for the bar: iterations on a log scale (the count is unknown). */
function progressFraction(iteration: number): number {
  return Math.min(0.95, Math.log1p(iteration) / Math.log1p(60));
}

/**
 * The profile explorer. Show it as a cell's last value or with `display()`; after the user
 * presses Fit (or cell code calls `fit()`), `result` holds the FitResult.
 */
export class Explorer {
  readonly widget: WidgetModel<ExplorerState>;
  readonly profile: Profile;
  private model: Model;
  private latest: FitResult | null = null;
  private running: RunningFit | null = null;

  constructor(profile: Profile, options: ExplorerOptions = {}) {
    if (!(profile?.x instanceof Float64Array) || !(profile.y instanceof Float64Array) || profile.x.length !== profile.y.length || profile.x.length < 2) {
      throw new InvalidArgumentError("profile", profile?.x?.length, "a Profile with Float64Array x and y of the same length ≥ 2 (positions in m)");
    }
    this.profile = profile;
    this.model = typeof options.model === "object" ? options.model : getModel(options.model ?? "two-slit");
    const params = paramsForModel(this.model);
    const start = { ...this.autoStart(options.start ?? {}), ...(options.start ?? {}) };
    for (const [name, value] of Object.entries(start)) {
      if (!params[name]) throw new InvalidArgumentError("start", name, `a parameter of model ${this.model.id}: ${Object.keys(params).join(", ")}`);
      params[name].value = value;
    }
    for (const name of options.fixed ?? []) {
      if (!params[name]) throw new InvalidArgumentError("fixed", name, `a parameter of model ${this.model.id}`);
      params[name].fixed = true;
    }
    this.widget = new WidgetModel<ExplorerState>(widgetIdentity("Explorer"), {
      title: options.title ?? "Profile explorer",
      x: profile.x, y: profile.y, sigma: profile.sigma ?? null, mask: profile.mask ?? null,
      counts: profile.counts, y_unit: profile.yUnit,
      model_id: this.model.id,
      model_choices: browserModelIds(this.model.id),
      params, noise: options.noise ?? "auto", window: null, masked_ranges: [],
      fit_state: "idle", fit_progress: 0, fit_message: "", result: null, fit_curve: null,
    }, { serializers: { x: typedArraySerializer, y: typedArraySerializer, sigma: typedArraySerializer, mask: typedArraySerializer, fit_curve: typedArraySerializer } });
    this.widget.onChange((changes, source) => {
      if (source === "frontend" && typeof changes.model_id === "string" && changes.model_id !== this.model.id) {
        this.model = getModel(changes.model_id);
      }
    });
    this.widget.onCustom((content) => {
      const action = (content as { action?: string } | null)?.action;
      if (action === "fit") void this.fit().catch(() => undefined);
      else if (action === "cancel") this.cancel();
    });
  }

  /** The latest fit (null before the first), in SI; the same object the widget shows. */
  get result(): FitResult | null {
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
  async fit(): Promise<FitResult> {
    if (this.running) throw new InvalidArgumentError("fit", "a fit is already running", "wait for it or cancel() it first");
    const { profile, options } = this.fitRequest();
    this.widget.set({ fit_state: "running", fit_progress: 0, fit_message: "fitting…" });
    try {
      this.running = startFit(profile, this.model, options, (p) => {
        this.widget.set({ fit_progress: progressFraction(p.iteration), fit_message: `iteration ${p.iteration}, objective ${p.objective.toPrecision(7)}` });
      });
      const result = await this.running.result;
      this.latest = result;
      const params = { ...this.widget.get("params") };
      for (const p of result.parameters) params[p.name] = { ...params[p.name]!, value: p.value };
      this.widget.set({
        result: fitSummary(result), fit_curve: result.model, params,
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

  /** Automatic starting values; the known wavelength and distance come from `given` when set there. */
  private autoStart(given: Record<string, number>): Record<string, number> {
    if (!supportsAutoStart(this.model)) return {};
    const value = (name: string) => given[name] ?? this.model.parameters.find((p) => p.name === name)!.default;
    const [first] = autoStartCandidates(this.profile.x, this.profile.y, value("wavelength"), value("distance"));
    return first ?? {};
  }
}

/**
 * Open a profile explorer on `profile` (positions in m).
 * @example const ex = explorer(profile, { model: "two-slit" }); ex   // then press Fit; ex.result
 */
export function explorer(profile: Profile, options: ExplorerOptions = {}): Explorer {
  return new Explorer(profile, options);
}
