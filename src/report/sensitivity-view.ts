import { findIndicator } from '../reference/indicators.ts';
import { barChart, type ChartDatum, type ChartView } from './charts.ts';
import { AUDIT_PAGE } from '../files.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatScientific, formatShare, NOT_AVAILABLE } from '../format.ts';
import type { SensitivityJson } from '../calc/sensitivity.ts';

export interface SensitivityView {
  step: string;
  scopes: Array<{
    title: string;
    value: string;
    rows: Array<{ rank: number; label: string; kind: string; source: { text: string; href: string }; contribution: string; share: string; minus: string; plus: string }>;
    charts: ChartView[];
  }>;
}

const KIND_NAMES: Record<string, string> = { factor: 'factor row', bom: 'BOM line', activity: 'activity', transport: 'transport leg', site: 'site row' };

/** The contribution and sensitivity section of a declaration page, with a bar chart and a tornado chart per result. */
export function sensitivityView(s: SensitivityJson, digits: number): SensitivityView {
  const unit = findIndicator(s.indicator)?.unit ?? '';
  const sci = (v: number | null) => (v === null || !Number.isFinite(v) ? NOT_AVAILABLE : formatScientific(v, digits));
  const step = formatShare(s.step);
  return {
    step,
    scopes: s.scopes.map((scope) => {
      const title = scope.module === 'D' ? `${s.indicator}, module D` : `${s.indicator}, ${scope.module}`;
      const kinds = [...new Set(scope.inputs.map((i) => KIND_NAMES[i.kind]!))];
      const contributions: ChartDatum[] = scope.inputs.map((i) => ({ label: i.label, group: KIND_NAMES[i.kind]!, value: i.contribution }));
      const tornado: ChartDatum[] = scope.inputs.flatMap((i) => [
        { label: i.label, group: `input −${step}`, value: -s.step * i.contribution },
        { label: i.label, group: `input +${step}`, value: s.step * i.contribution },
      ]);
      const id = scope.module === 'D' ? 'd' : 'a1a3';
      const axis = `${s.indicator} (${unit})`;
      const charts: ChartView[] = scope.inputs.length === 0 ? [] : [
        {
          id: `chart-contributors-${id}`,
          title: `Largest contributions to ${title}`,
          alt: `Bar chart of the ${scope.inputs.length} inputs that contribute most to ${title}: ${scope.inputs.map((i) => `${i.label} ${sci(i.contribution)}`).join(', ')} ${unit}.`,
          unit,
          data: contributions,
          table: { headers: ['Input', 'Kind', axis], rows: contributions.map((d) => [d.label, d.group, sci(d.value)]) },
          spec: barChart(contributions, axis, kinds),
        },
        {
          id: `chart-tornado-${id}`,
          title: `${title} with each input ±${step}`,
          alt: `Tornado chart: the change in ${title} when each input is moved by −${step} and +${step}, largest first: ${scope.inputs.map((i) => `${i.label} ±${sci(Math.abs(s.step * i.contribution))}`).join(', ')} ${unit}.`,
          unit,
          data: tornado,
          table: { headers: ['Input', 'Change', `Change in ${axis}`], rows: tornado.map((d) => [d.label, d.group, sci(d.value)]) },
          spec: barChart(tornado, `Change in ${axis}`, [`input −${step}`, `input +${step}`]),
        },
      ];
      return {
        title,
        value: sci(scope.value),
        rows: scope.inputs.map((i, k) => ({
          rank: k + 1,
          label: i.label,
          kind: KIND_NAMES[i.kind]!,
          source: { text: `${i.file}:${i.line}${i.column ? ` ${i.column}` : ''}`, href: `${AUDIT_PAGE}#${fragment(inputAnchor(i.file, i.line))}` },
          contribution: sci(i.contribution),
          share: i.share === null ? NOT_AVAILABLE : formatShare(i.share),
          minus: sci(i.minus),
          plus: sci(i.plus),
        })),
        charts,
      };
    }),
  };
}
