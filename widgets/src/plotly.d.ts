// Minimal typing of the plotly.js calls the widgets use (the package ships no types).
declare module "plotly.js-dist-min" {
  export type PlotData = Record<string, unknown>;
  export type Layout = Record<string, unknown>;
  export type Config = Record<string, unknown>;
  export interface PlotlyHTMLElement extends HTMLDivElement {
    on(event: string, handler: (data: any) => void): void;
    removeAllListeners?(event: string): void;
    _fullLayout?: any;
  }
  export interface ImageOptions { format: "png" | "svg" | "jpeg" | "webp"; width?: number; height?: number; filename?: string; scale?: number }
  const Plotly: {
    newPlot(el: HTMLElement, data: PlotData[], layout?: Layout, config?: Config): Promise<PlotlyHTMLElement>;
    react(el: HTMLElement, data: PlotData[], layout?: Layout, config?: Config): Promise<PlotlyHTMLElement>;
    restyle(el: HTMLElement, update: Record<string, unknown>, traces?: number | number[]): Promise<PlotlyHTMLElement>;
    relayout(el: HTMLElement, update: Record<string, unknown>): Promise<PlotlyHTMLElement>;
    purge(el: HTMLElement): void;
    toImage(el: HTMLElement, opts: ImageOptions): Promise<string>;
    downloadImage(el: HTMLElement, opts: ImageOptions): Promise<string>;
    Plots: { resize(el: HTMLElement): Promise<void> };
  };
  export default Plotly;
}
