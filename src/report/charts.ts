/**
 * The declaration's charts as vega-lite specifications (data inline), turned into SVG at
 * build time by src/render/charts.ts. Colours: the Okabe–Ito palette (Okabe & Ito 2008,
 * "Color Universal Design"), distinguishable with the common colour-vision deficiencies;
 * module D is also set apart by its own category, not by colour alone.
 */
export const OKABE_ITO = ['#0072B2', '#E69F00', '#009E73', '#D55E00', '#56B4E9', '#CC79A7', '#F0E442', '#000000'];

export interface ChartDatum {
  label: string;
  group: string;
  value: number;
}

export interface ChartView {
  id: string;
  title: string;
  /** Text alternative: what the chart shows, in one or two sentences. */
  alt: string;
  unit: string;
  data: ChartDatum[];
  /** The chart's data as a table, already formatted. */
  table: { headers: string[]; rows: string[][] };
  spec: Record<string, unknown>;
  /** Filled in by the renderer. */
  svg?: string;
}

const FONT = 'DejaVu Sans, sans-serif';

/** A horizontal bar chart, one bar per datum in the given order, coloured by group. */
export function barChart(data: ChartDatum[], unit: string, groups: string[]): Record<string, unknown> {
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    // At most about 680 px wide with its labels, so that a printed A4 page (703 px between the margins) holds it
    // unscaled and its 11 px text prints at 8.25 pt.
    width: 400,
    height: { step: 18 },
    background: '#ffffff',
    config: { font: FONT, axis: { labelFontSize: 11, titleFontSize: 11, labelLimit: 230 }, legend: { labelFontSize: 11, titleFontSize: 11, labelLimit: 230 }, view: { stroke: null } },
    data: { values: data.map((d, order) => ({ ...d, order })) },
    mark: { type: 'bar' },
    encoding: {
      y: { field: 'label', type: 'nominal', sort: { field: 'order' }, title: null },
      x: { field: 'value', type: 'quantitative', title: unit, axis: { format: '.3~g', grid: true } },
      color: { field: 'group', type: 'nominal', title: null, scale: { domain: groups, range: OKABE_ITO.slice(0, groups.length) }, legend: { orient: 'bottom' } },
    },
  };
}
