/**
 * Kernel side of the uncertainty widget: profile-likelihood curves (re-fits with the parameter
 * held at grid values) and intervals for the chosen parameters, and the correlation matrix.
 */
import { isFit, type Fit } from "../../src/api/fit.js";
import { InvalidArgumentError } from "../../src/errors.js";
import { profileInterval, type ProfileInterval } from "../../src/fit/profileInterval.js";
import type { FitResult } from "../../src/fit/types.js";
import type { Model } from "../../src/physics/model.js";
import type { Profile } from "../../src/profile.js";
import { profileCurve } from "../../src/fit/profileCurve.js";
import type { ProfileCurve } from "../../src/fit/profileCurve.js";
import type { ProfiledParameter } from "../../widgets/shared/state.js";
import { display, MIME_BUNDLE, type MimeBundle } from "../display.js";
import { WidgetModel } from "../widget/model.js";
import { ndArraySerializer, type NdArray } from "../widget/serializers.js";
import { fallbackBundle } from "./fallback.js";
import { widgetIdentity } from "./identity.js";

interface UncertaintyState extends Record<string, unknown> {
  title: string;
  parameters: ProfiledParameter[];
  grid: NdArray | null;
  delta: NdArray | null;
  level: number;
  threshold: number;
  free_names: string[];
  correlation: NdArray | null;
  model_id: string;
}

export interface UncertaintyOptions {
  /** Free parameters to profile (default: the first four free ones). */
  names?: string[];
  /** Confidence level of the intervals (default 0.6827, one standard deviation). */
  level?: number;
  /** Grid points per curve (default 15; each costs one fit). */
  points?: number;
  title?: string;
}

/** The uncertainty widget; `intervals` and `curves` are there for cell code too. */
export class UncertaintyWidget {
  readonly widget: WidgetModel<UncertaintyState>;
  readonly intervals: ProfileInterval[];
  readonly curves: ProfileCurve[];

  constructor(result: FitResult, profile: Profile, model: Model, options: UncertaintyOptions = {}) {
    const names = options.names ?? result.freeNames.slice(0, 4);
    for (const name of names) {
      if (!result.freeNames.includes(name)) throw new InvalidArgumentError("names", name, `free parameters of the fit: ${result.freeNames.join(", ")}`);
    }
    const level = options.level ?? 0.6827;
    const points = options.points ?? 15;
    this.curves = names.map((name) => profileCurve(result, profile, model, name, { points }));
    this.intervals = names.map((name) => profileInterval(result, profile, model, name, level));
    const grid = new Float64Array(names.length * points);
    const delta = new Float64Array(names.length * points);
    this.curves.forEach((c, k) => {
      grid.set(Float64Array.from(c.values), k * points);
      delta.set(Float64Array.from(c.deltaObjective), k * points);
    });
    const k = result.freeNames.length;
    this.widget = new WidgetModel<UncertaintyState>(widgetIdentity("Uncertainty"), {
      title: options.title ?? "Uncertainty",
      parameters: this.intervals.map((iv) => {
        const p = result.parameters.find((q) => q.name === iv.parameter)!;
        return { name: iv.parameter, unit: iv.unit, best: iv.value, uncertainty: Number.isFinite(p.uncertainty) ? p.uncertainty : null,
          interval: [iv.openLower ? null : iv.lower, iv.openUpper ? null : iv.upper] as [number | null, number | null] };
      }),
      grid: { data: grid, shape: [names.length, points] },
      delta: { data: delta, shape: [names.length, points] },
      level,
      threshold: this.intervals[0]?.threshold ?? 1,
      free_names: [...result.freeNames],
      correlation: { data: Float64Array.from(result.correlation), shape: [k, k] },
      model_id: result.modelId,
    }, { serializers: { grid: ndArraySerializer, delta: ndArraySerializer, correlation: ndArraySerializer } });
  }

  /** Widget view plus text/plain and text/html listing the intervals. */
  [MIME_BUNDLE](): MimeBundle {
    const facts = this.intervals.map((iv) => `${iv.parameter}: ${iv.openLower ? "open" : iv.lower.toPrecision(6)} … ${iv.openUpper ? "open" : iv.upper.toPrecision(6)} ${iv.unit} (${(iv.level * 100).toFixed(2)} %, best ${iv.value.toPrecision(6)})`);
    return { ...this.widget.viewBundle(), ...fallbackBundle("Profile-likelihood intervals", facts, null) };
  }

  display(): void {
    display(this);
  }

  close(): void {
    this.widget.close();
  }
}

/**
 * Profile-likelihood curves, intervals and correlations of a fit in a widget, re-fitted with
 * the fit's own model and options.
 * @example uncertainty(fit, { names: ["bandwidth"], level: 0.95 })
 */
export function uncertainty(fit: Fit, options?: UncertaintyOptions): UncertaintyWidget;
/** The same for a plain FitResult: give the profile and model the fit used. */
export function uncertainty(result: FitResult, profile: Profile, model: Model, options?: UncertaintyOptions): UncertaintyWidget;
export function uncertainty(result: FitResult | Fit, a?: Profile | UncertaintyOptions, model?: Model, options: UncertaintyOptions = {}): UncertaintyWidget {
  if (isFit(result) && model === undefined) return new UncertaintyWidget(result, result.profile, result.fittedModel, (a as UncertaintyOptions | undefined) ?? {});
  if (!model || !a) throw new InvalidArgumentError("uncertainty", "a result without its profile and model", "a fit from fitProfile, or (result, profile, model)");
  return new UncertaintyWidget(result, a as Profile, model, options);
}
