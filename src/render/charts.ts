import { compile } from 'vega-lite';
import { parse, View } from 'vega';
import type { ChartView } from '../report/charts.ts';

/**
 * vega-lite → vega → SVG, headless (renderer 'none': no canvas, no browser), so charts are
 * in the HTML as plain SVG: visible without JavaScript and crisp in the PDF. Text in the
 * SVG is escaped by vega's SVG string renderer.
 */
export async function renderChartSvg(chart: ChartView): Promise<string> {
  const view = new View(parse(compile(chart.spec as never).spec), { renderer: 'none' });
  try {
    const svg = await view.toSVG();
    // The chart is described by the figure around it; the SVG itself is decoration for assistive technology.
    return svg.replace(/^<svg /, '<svg aria-hidden="true" focusable="false" ');
  } finally {
    view.finalize();
  }
}
