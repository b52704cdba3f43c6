import { compile } from 'vega-lite';
import { parse, View, type Runtime } from 'vega';
import type { ChartView } from '../report/charts.ts';

/** The dataset name the compiled chart reads its rows from. */
const DATA = 'rows';

/**
 * Compiling and parsing a chart is most of its cost, and every product's chart of a kind
 * differs only in its rows: one parsed runtime per specification, data swapped per chart.
 * A view is made per chart and not kept: a kept view updated with other rows keeps the
 * scenegraph items that stay (axis ticks), and its SVG then depends on the charts drawn
 * before it, so output would vary with the shard split (tried: 15 % faster, not byte-stable).
 */
const runtimes = new Map<string, Runtime>();

function runtimeOf(spec: Record<string, unknown>): Runtime {
  const key = JSON.stringify(spec);
  let runtime = runtimes.get(key);
  if (!runtime) {
    runtime = parse(compile({ ...spec, data: { name: DATA } } as never).spec);
    runtimes.set(key, runtime);
  }
  return runtime;
}

/**
 * vega-lite → vega → SVG, headless (renderer 'none': no canvas, no browser), so charts are
 * in the HTML as plain SVG: visible without JavaScript and crisp in the PDF. Text in the
 * SVG is escaped by vega's SVG string renderer.
 */
export async function renderChartSvg(chart: ChartView): Promise<string> {
  const { data, ...spec } = chart.spec as { data: { values: unknown[] } } & Record<string, unknown>;
  const view = new View(runtimeOf(spec), { renderer: 'none' });
  try {
    view.data(DATA, data.values);
    const svg = await view.toSVG();
    // The chart is described by the figure around it; the SVG itself is decoration for assistive technology.
    return svg.replace(/^<svg /, '<svg aria-hidden="true" focusable="false" ');
  } finally {
    view.finalize();
  }
}
