import { unzipSync } from 'fflate';
import { INDICATOR_BY_UUID, NS, type Characterisation } from '../reference/ilcd.ts';
import { attrOf, childOf, childrenOf, parseXml, pathOf, XmlSyntaxError, type XmlElement } from './xml.ts';

/**
 * Reads ILCD+EPD datasets: an EPD process dataset (`.xml`) or an ILCD archive (`.zip`) that
 * holds one with its product flow. Every value keeps the file (an archive's entry as
 * `archive.zip!ILCD/processes/<uuid>.xml`), the line and the column of its element, so a
 * figure that uses it can cite it. Reading states what the dataset says; what is wrong with
 * it for a given use (another EN 15804 version, a missing indicator, an expired validity) is
 * judged by the caller (src/model/supplier-datasets.ts).
 */
export interface Located {
  /** The file, or `archive!entry` inside an archive. */
  file: string;
  line: number;
  column: number;
}

export interface EpdAmount extends Located {
  module: string;
  scenario: string | undefined;
  /** The number written; null where the element is empty or not a number ("not available"). */
  value: number | null;
  text: string;
}

export interface EpdIndicator extends Located {
  code: string;
  uuid: string;
  characterisation: Characterisation;
  amounts: EpdAmount[];
}

export interface FlowPropertyValue extends Located {
  uuid: string;
  name: string;
  meanValue: number | null;
}

export interface ProductFlow {
  file: string;
  /** The dataset's text, for quoting an element's line. */
  source: string;
  uuid: string;
  /** Its flow properties; the reference property first. */
  properties: FlowPropertyValue[];
  /** The MatML "conversion factor to 1 kg", where given. */
  conversionToKg: (Located & { value: number | null }) | undefined;
}

export interface EpdDataset {
  file: string;
  /** The dataset's text, for quoting an element's line. */
  source: string;
  uuid: string;
  name: string;
  typeOfDataSet: string | undefined;
  /** Compliance systems referenced (UUIDs, lower case), with their short descriptions. */
  compliance: Array<Located & { uuid: string; text: string }>;
  referenceYear: number | undefined;
  /** `common:dataSetValidUntil` (a year) and the EPD's expiration date, where given. */
  validUntil: (Located & { year: number }) | undefined;
  expiration: (Located & { date: string }) | undefined;
  /** The review types written (`Not reviewed`, `Independent external review`, …). */
  reviews: Array<Located & { type: string }>;
  /** The reference flow's exchange: the product flow's UUID and the amount declared (in the reference unit of its reference property). */
  referenceFlow: (Located & { uuid: string; amount: number | null }) | undefined;
  /** Indicators of the published EN 15804+A2 lists (EF 3.1 and EF 3.0), by code. */
  indicators: Map<string, EpdIndicator>;
  /** Exchanges and LCIA results whose UUID is on neither list (EN 15804+A1 indicators among them). */
  unlisted: Array<Located & { uuid: string; text: string }>;
  /** The product flow dataset, where the archive holds it. */
  flow: ProductFlow | undefined;
}

/** The largest supplier dataset read (and the largest dataset in an archive, inflated): declarations are tens of kB; 50 MB is far beyond any. */
export const MAX_DATASET_BYTES = 50e6;

export class DatasetError extends Error {
  constructor(
    message: string,
    readonly where: Located,
  ) {
    super(message);
  }
}

const number = (text: string): number | null => (/^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(text.trim()) ? Number(text.trim()) : null);
const at = (file: string, element: XmlElement): Located => ({ file, line: element.line, column: element.column });
const description = (element: XmlElement | undefined): string => childOf(element, NS.common, 'shortDescription')?.text ?? '';

function parseAt(file: string, text: string): XmlElement {
  try {
    return parseXml(text);
  } catch (error) {
    if (error instanceof XmlSyntaxError) throw new DatasetError(`is not well-formed XML: ${error.message}`, { file, line: error.line, column: error.column });
    throw error;
  }
}

/** The amounts under an exchange's or LCIA result's `common:other`. */
function amountsOf(file: string, owner: XmlElement): EpdAmount[] {
  return childrenOf(childOf(owner, NS.common, 'other'), NS.epd, 'amount').map((amount) => ({
    ...at(file, amount),
    module: attrOf(amount, NS.epd, 'module') ?? '',
    scenario: attrOf(amount, NS.epd, 'scenario'),
    value: number(amount.text),
    text: amount.text,
  }));
}

/** Reads an EPD process dataset from its text. */
export function readProcessDataset(file: string, text: string): EpdDataset {
  const root = parseAt(file, text);
  if (root.ns !== NS.process || root.name !== 'processDataSet') throw new DatasetError(`is not an ILCD process dataset (its root element is ${root.name})`, at(file, root));
  const information = childOf(root, NS.process, 'processInformation');
  const info = childOf(information, NS.process, 'dataSetInformation');
  const time = childOf(information, NS.process, 'time');
  const modelling = childOf(root, NS.process, 'modellingAndValidation');
  const indicators = new Map<string, EpdIndicator>();
  const unlisted: EpdDataset['unlisted'] = [];
  const take = (owner: XmlElement, reference: XmlElement | undefined) => {
    const uuid = (attrOf(reference, '', 'refObjectId') ?? '').trim().toLowerCase();
    const listed = INDICATOR_BY_UUID.get(uuid);
    if (!reference) return;
    if (!listed) unlisted.push({ ...at(file, reference), uuid, text: description(reference) });
    else indicators.set(listed.code, { ...at(file, reference), code: listed.code, uuid, characterisation: listed.characterisation, amounts: amountsOf(file, owner) });
  };
  const quantitative = childOf(information, NS.process, 'quantitativeReference');
  const referenceId = childOf(quantitative, NS.process, 'referenceToReferenceFlow')?.text;
  let referenceFlow: EpdDataset['referenceFlow'];
  for (const exchange of childrenOf(childOf(root, NS.process, 'exchanges'), NS.process, 'exchange')) {
    const flow = childOf(exchange, NS.process, 'referenceToFlowDataSet');
    if (attrOf(exchange, '', 'dataSetInternalID') === referenceId) {
      const amount = childOf(exchange, NS.process, 'meanAmount');
      referenceFlow = { ...at(file, amount ?? exchange), uuid: (attrOf(flow, '', 'refObjectId') ?? '').toLowerCase(), amount: amount ? number(amount.text) : null };
    } else take(exchange, flow);
  }
  for (const result of childrenOf(childOf(root, NS.process, 'LCIAResults'), NS.process, 'LCIAResult')) take(result, childOf(result, NS.process, 'referenceToLCIAMethodDataSet'));
  const validUntil = childOf(time, NS.common, 'dataSetValidUntil');
  const expiration = childOf(childOf(time, NS.common, 'other'), NS.epd24, 'expirationDateOfEPD');
  const year = childOf(time, NS.common, 'referenceYear');
  return {
    file,
    source: text,
    uuid: (childOf(info, NS.common, 'UUID')?.text ?? '').toLowerCase(),
    name: childrenOf(childOf(info, NS.process, 'name'), NS.process, 'baseName').find((n) => n.attrs[`{${NS.xml}}lang`] === 'en')?.text ?? childOf(childOf(info, NS.process, 'name'), NS.process, 'baseName')?.text ?? '',
    typeOfDataSet: pathOf(modelling, [NS.process, 'LCIMethodAndAllocation'], [NS.process, 'typeOfDataSet'])?.text,
    compliance: childrenOf(childOf(modelling, NS.process, 'complianceDeclarations'), NS.process, 'compliance').flatMap((compliance) => {
      const ref = childOf(compliance, NS.common, 'referenceToComplianceSystem');
      return ref ? [{ ...at(file, ref), uuid: (attrOf(ref, '', 'refObjectId') ?? '').toLowerCase(), text: description(ref) }] : [];
    }),
    referenceYear: year && number(year.text) !== null ? number(year.text)! : undefined,
    validUntil: validUntil && number(validUntil.text) !== null ? { ...at(file, validUntil), year: number(validUntil.text)! } : undefined,
    expiration: expiration ? { ...at(file, expiration), date: expiration.text } : undefined,
    reviews: childrenOf(childOf(modelling, NS.process, 'validation'), NS.process, 'review').map((review) => ({ ...at(file, review), type: attrOf(review, '', 'type') ?? '' })),
    referenceFlow,
    indicators,
    unlisted,
    flow: undefined,
  };
}

/** Reads a product flow dataset: its flow properties (reference first) and the MatML conversion factor to 1 kg. */
export function readFlowDataset(file: string, text: string): ProductFlow {
  const root = parseAt(file, text);
  if (root.ns !== NS.flow || root.name !== 'flowDataSet') throw new DatasetError(`is not an ILCD flow dataset (its root element is ${root.name})`, at(file, root));
  const information = childOf(root, NS.flow, 'flowInformation');
  const referenceId = pathOf(information, [NS.flow, 'quantitativeReference'], [NS.flow, 'referenceToReferenceFlowProperty'])?.text;
  const properties = childrenOf(childOf(root, NS.flow, 'flowProperties'), NS.flow, 'flowProperty').map((property) => {
    const ref = childOf(property, NS.flow, 'referenceToFlowPropertyDataSet');
    const mean = childOf(property, NS.flow, 'meanValue');
    return { id: attrOf(property, '', 'dataSetInternalID'), value: { ...at(file, mean ?? property), uuid: (attrOf(ref, '', 'refObjectId') ?? '').toLowerCase(), name: description(ref), meanValue: mean ? number(mean.text) : null } };
  });
  const sorted = [...properties.filter((p) => p.id === referenceId), ...properties.filter((p) => p.id !== referenceId)].map((p) => p.value);
  let conversionToKg: ProductFlow['conversionToKg'];
  const matml = childOf(pathOf(information, [NS.flow, 'dataSetInformation'], [NS.common, 'other']), NS.mat, 'MatML_Doc');
  if (matml) {
    const details = childrenOf(childOf(matml, NS.mat, 'Metadata'), NS.mat, 'PropertyDetails').find((d) => childOf(d, NS.mat, 'Name')?.text === 'conversion factor to 1 kg');
    const id = attrOf(details, '', 'id');
    const data = childrenOf(pathOf(matml, [NS.mat, 'Material'], [NS.mat, 'BulkDetails']), NS.mat, 'PropertyData').find((d) => attrOf(d, '', 'property') === id);
    const value = childOf(data, NS.mat, 'Data');
    if (details && value) conversionToKg = { ...at(file, value), value: number(value.text) };
  }
  return { file, source: text, uuid: (pathOf(information, [NS.flow, 'dataSetInformation'], [NS.common, 'UUID'])?.text ?? '').toLowerCase(), properties: sorted, conversionToKg };
}

/**
 * Reads a supplier's dataset from the bytes of its file: an EPD process dataset, or an ILCD
 * archive holding exactly one EPD process dataset (and, where included, its product flow).
 */
export function readEpdFile(file: string, bytes: Uint8Array): EpdDataset {
  if (bytes.byteLength > MAX_DATASET_BYTES) throw new DatasetError(`is ${Math.round(bytes.byteLength / 1e6)} MB; a supplier dataset has at most ${MAX_DATASET_BYTES / 1e6} MB`, { file, line: 1, column: 1 });
  if (!(bytes[0] === 0x50 && bytes[1] === 0x4b)) return readProcessDataset(file, new TextDecoder('utf-8', { fatal: false }).decode(bytes));
  let entries: Record<string, Uint8Array>;
  const large: string[] = [];
  try {
    // Only the datasets read are inflated, and none beyond the limit (a zip can claim any size: it is checked as it inflates too).
    entries = unzipSync(bytes, {
      filter: (entry) => {
        if (!/(^|\/)(processes|flows)\/[^/]+\.xml$/i.test(entry.name)) return false;
        if (entry.originalSize > MAX_DATASET_BYTES) large.push(entry.name);
        return entry.originalSize <= MAX_DATASET_BYTES;
      },
    });
  } catch (error) {
    throw new DatasetError(`is not a readable zip archive: ${(error as Error).message}`, { file, line: 1, column: 1 });
  }
  if (large.length > 0) throw new DatasetError(`holds ${large[0]}, larger than ${MAX_DATASET_BYTES / 1e6} MB once inflated`, { file, line: 1, column: 1 });
  for (const [name, entry] of Object.entries(entries)) if (entry.byteLength > MAX_DATASET_BYTES) throw new DatasetError(`holds ${name}, larger than ${MAX_DATASET_BYTES / 1e6} MB once inflated`, { file, line: 1, column: 1 });
  const text = (name: string) => new TextDecoder('utf-8').decode(entries[name]!);
  const names = Object.keys(entries).sort();
  const processes = names.filter((name) => /(^|\/)processes\/[^/]+\.xml$/i.test(name));
  const epds = processes.map((name) => readProcessDataset(`${file}!${name}`, text(name))).filter((dataset) => dataset.typeOfDataSet === 'EPD');
  if (epds.length !== 1) throw new DatasetError(`holds ${epds.length === 0 ? 'no EPD process dataset' : `${epds.length} EPD process datasets`} (ILCD/processes/*.xml of type EPD); a supplier dataset is one declaration`, { file, line: 1, column: 1 });
  const dataset = epds[0]!;
  const flowUuid = dataset.referenceFlow?.uuid;
  const flowName = names.find((name) => /(^|\/)flows\/[^/]+\.xml$/i.test(name) && flowUuid !== undefined && name.toLowerCase().includes(flowUuid));
  if (flowName) dataset.flow = readFlowDataset(`${file}!${flowName}`, text(flowName));
  return dataset;
}
