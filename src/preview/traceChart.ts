// The trace of the motion under the editor's cursor: three small charts that
// share the time axis (yaw with its target and stop band; wheel power; wheel
// speed), drawn by uPlot on canvases. Colours come from the editor theme's CSS
// variables, read when the charts are built and again when the theme changes.
import uPlot from 'uplot';
import type { TraceColumns, TraceMessage } from '../shared/messages';

/** Height of each chart's plotting area and axes, CSS pixels. */
const CHART_HEIGHT = 72;
/** Width kept for every y axis, so the three plotting areas line up. */
const Y_AXIS_SIZE = 52;
const BAND_ALPHA = 0.18;

interface Palette {
  fg: string;
  muted: string;
  grid: string;
  left: string;
  right: string;
  target: string;
  error: string;
  band: string;
  font: string;
}

type Series = uPlot.Series & { label: string };

interface ChartSpec {
  name: string;
  /** The y axis's title. */
  axis: string;
  unit: string;
  series: (p: Palette) => Series[];
  columns: (c: TraceColumns, stop: number | undefined) => (number | null)[][];
  bands?: (p: Palette) => uPlot.Band[];
}

/** The colour `css` as the canvas reads it (#rrggbb or rgba()), with `alpha` applied. */
function withAlpha(css: string, alpha: number): string {
  const ctx = document.createElement('canvas').getContext('2d');
  if (!ctx) return css;
  ctx.fillStyle = '#000';
  ctx.fillStyle = css;
  const hex = /^#([0-9a-f]{6})$/i.exec(ctx.fillStyle);
  if (hex) {
    const n = parseInt(hex[1]!, 16);
    return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
  }
  return ctx.fillStyle.replace(/rgba\(([^)]*),\s*[\d.]+\)/, `rgba($1, ${alpha})`);
}

function readPalette(el: Element): Palette {
  const style = getComputedStyle(el);
  const v = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  const zone = v('--veer-zone', '#388a34');
  return {
    fg: v('--veer-fg', '#1f1f1f'),
    muted: v('--veer-muted', '#6e7681'),
    grid: withAlpha(v('--veer-grid', '#d3d3d3'), 0.6),
    left: v('--veer-run-0', '#1a85ff'),
    right: v('--veer-run-1', '#652d90'),
    target: v('--veer-fg', '#1f1f1f'),
    error: v('--veer-current', '#d18616'),
    band: withAlpha(zone, BAND_ALPHA),
    font: `11px ${style.fontFamily || 'sans-serif'}`,
  };
}

const line = (label: string, stroke: string, extra: Omit<uPlot.Series, 'label'> = {}): Series => ({ stroke, width: 1.5, points: { show: false }, ...extra, label });

const CHARTS: ChartSpec[] = [
  {
    name: 'yaw',
    axis: 'yaw °',
    unit: '°',
    series: (p) => [
      line('reading', p.left),
      line('target', p.target, { dash: [5, 4], width: 1 }),
      line('error', p.error),
      // The stop band's edges: drawn only as the band between them, so no legend entry of their own.
      line('stop band', 'transparent', { width: 0, class: 'band-high' }),
      line('stop band low', 'transparent', { width: 0, class: 'band-low' }),
    ],
    columns: (c, stop) => {
      const has = stop !== undefined && Number.isFinite(stop) && stop > 0;
      return [
        c.reading, c.target, c.error,
        c.target.map((v) => (has && v !== null ? v + stop! : null)),
        c.target.map((v) => (has && v !== null ? v - stop! : null)),
      ];
    },
    bands: (p) => [{ series: [4, 5], fill: p.band }],
  },
  {
    name: 'power',
    axis: 'power %',
    unit: '%',
    series: (p) => [line('left power', p.left), line('right power', p.right, { dash: [6, 3] })],
    columns: (c) => [c.powerLeft, c.powerRight],
  },
  {
    name: 'speed',
    axis: 'wheel mm/s',
    unit: 'mm/s',
    series: (p) => [line('left speed', p.left), line('right speed', p.right, { dash: [6, 3] })],
    columns: (c) => [c.speedLeft, c.speedRight],
  },
];

const fixed = (digits: number) => (_u: uPlot, v: number | null) => (v === null || v === undefined ? '–' : v.toFixed(digits));

export class TraceChart {
  readonly element = document.createElement('div');
  private readonly heading = document.createElement('div');
  private readonly note = document.createElement('div');
  private readonly charts = document.createElement('div');
  private plots: uPlot[] = [];
  private last: TraceMessage | undefined;
  private width = 0;
  /** Incremented per trace shown; `data-drawn` takes its value once every chart has drawn it. */
  private shown = 0;
  private pendingDraws = 0;

  constructor() {
    this.element.className = 'trace';
    this.heading.className = 'trace-title';
    this.note.className = 'trace-note';
    this.charts.className = 'trace-charts';
    this.charts.setAttribute('role', 'img');
    this.element.append(this.heading, this.note, this.charts);
    this.heading.textContent = 'Put the cursor on a motion to see its predicted trace.';
    this.note.hidden = true;
    new ResizeObserver(() => this.resize()).observe(this.charts);
    // The editor switches themes by the body's class and the variables on <html>.
    const rebuild = () => { if (this.plots.length) this.build(); };
    new MutationObserver(rebuild).observe(document.body, { attributes: true, attributeFilter: ['class'] });
    new MutationObserver(rebuild).observe(document.documentElement, { attributes: true, attributeFilter: ['style'] });
  }

  /** The line the chart shows, or undefined before the first trace. */
  get line(): number | undefined {
    return this.last?.line;
  }

  show(message: TraceMessage): void {
    this.last = message;
    this.heading.textContent = message.title || (message.line >= 0 ? `Line ${message.line + 1}` : '');
    this.element.dataset.line = String(message.line);
    const columns = message.columns && message.columns.t.length > 0 ? message.columns : undefined;
    this.note.textContent = columns ? '' : (message.note ?? 'No predicted trace for this line.');
    this.note.hidden = !!columns;
    this.charts.hidden = !columns;
    this.shown++;
    if (!columns) {
      this.element.dataset.drawn = String(this.shown);
      return;
    }
    this.charts.setAttribute('aria-label', `${message.title}: yaw reading, target and error; left and right power; left and right wheel speed over ${columns.t.length} samples`);
    if (this.plots.length === 0) this.build();
    else this.setData(columns, message.stop);
  }

  /** (Re)creates the charts with the theme's current colours and the last trace's data. */
  private build(): void {
    for (const p of this.plots) p.destroy();
    this.plots = [];
    const columns = this.last?.columns;
    if (!columns || columns.t.length === 0) return;
    const palette = readPalette(this.element);
    // uPlot may draw while it is being built: count the charts first.
    this.pendingDraws = CHARTS.length;
    this.width = Math.max(200, Math.floor(this.charts.clientWidth || this.element.clientWidth || 600));
    CHARTS.forEach((spec, i) => {
      const lastChart = i === CHARTS.length - 1;
      const axis = (side: 'x' | 'y'): uPlot.Axis => ({
        stroke: palette.muted,
        font: palette.font,
        labelFont: palette.font,
        grid: { stroke: palette.grid, width: 1 },
        ticks: { stroke: palette.grid, width: 1, size: 4 },
        ...(side === 'y'
          ? { size: Y_AXIS_SIZE, label: spec.axis, labelSize: 14, space: 22, values: (_u: uPlot, splits: number[]) => splits.map((v) => String(Number(v.toFixed(2)))) }
          : { show: true, size: lastChart ? 30 : 6, values: lastChart ? (_u: uPlot, splits: number[]) => splits.map((v) => `${Number(v.toFixed(2))} s`) : () => [] }),
      });
      const options: uPlot.Options = {
        class: `trace-${spec.name}`,
        width: this.width,
        height: CHART_HEIGHT + (lastChart ? 24 : 0),
        pxAlign: false,
        scales: { x: { time: false } },
        series: [{ label: 'time s', value: fixed(2) }, ...spec.series(palette).map((s) => ({ ...s, value: fixed(spec.unit === 'mm/s' ? 0 : 1) }))],
        axes: [axis('x'), axis('y')],
        ...(spec.bands ? { bands: spec.bands(palette) } : {}),
        cursor: { sync: { key: 'veer-trace' }, drag: { x: false, y: false }, points: { show: false } },
        legend: { live: true },
        hooks: { draw: [() => this.drew()] },
      };
      this.plots.push(new uPlot(options, this.dataFor(spec, columns, this.last?.stop), this.charts));
    });
  }

  private dataFor(spec: ChartSpec, columns: TraceColumns, stop: number | undefined): uPlot.AlignedData {
    return [columns.t, ...spec.columns(columns, stop)] as uPlot.AlignedData;
  }

  private setData(columns: TraceColumns, stop: number | undefined): void {
    this.pendingDraws = this.plots.length;
    this.plots.forEach((p, i) => p.setData(this.dataFor(CHARTS[i]!, columns, stop)));
  }

  private drew(): void {
    if (this.pendingDraws > 0 && --this.pendingDraws === 0) this.element.dataset.drawn = String(this.shown);
  }

  private resize(): void {
    const width = Math.floor(this.charts.clientWidth);
    if (width < 50 || Math.abs(width - this.width) < 2) return;
    this.width = width;
    for (const p of this.plots) p.setSize({ width, height: p.height });
  }
}
