import type { Declaration } from '../schema/declaration.ts';
import { findIndicator } from '../reference/indicators.ts';
import {
  BIOGENIC_CARBON,
  BIOGENIC_CARBON_PACKAGING,
  EPD_FORMAT_VERSION,
  MASS,
  NS,
  SOURCES,
  datasetUuid,
  exchangeDirection,
  isImpactIndicator,
  type FlowProperty,
  type Reference,
  type UnitGroup,
} from '../reference/ilcd.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import type { IndicatorValues } from './results.ts';
import { processUuidOf } from './ilcd-link.ts';
import { declaredQuantity, type ExportedDeclaration } from './ilcd-declaration.ts';
import { Doc, double, el, lang, sentence, type Node } from './ilcd-xml.ts';

/**
 * A declaration as an ILCD+EPD archive's datasets: the process dataset of type EPD, its
 * reference product flow, the owner (and verifier) as contacts, the PCR, the background data and
 * the verification as sources, and the flow properties and unit groups it uses (published
 * UUIDs). Each dataset is one XML document (src/report/ilcd-xml.ts); the caller zips them (src/render/ilcd-archive.ts). Field by field, what is written
 * and where it comes from is listed in DEVELOPERS.md ("The ILCD+EPD export").
 */

/** One dataset of the archive: its path inside the archive (ILCD/<folder>/<uuid>.xml) and its text. */
export interface IlcdFile {
  path: string;
  xml: string;
}

/** The version every dataset carries: loopsheet writes each archive whole, so each dataset is its first version. */
export const DATASET_VERSION = '01.00.000';

/** The modules written: A1-A3 aggregated (not A1, A2 and A3 besides, which a reader would add twice), then every other declared module. */
export const exportedModules = (modules: Readonly<Record<string, IndicatorValues>>): string[] => Object.keys(modules).filter((module) => !['A1', 'A2', 'A3'].includes(module));

type Folder = 'processes' | 'flows' | 'contacts' | 'sources' | 'unitgroups' | 'flowproperties';
interface Ref {
  /** The folder of the archive it is in; none for a dataset referenced by its published UUID and not included. */
  folder?: Folder;
  type: string;
  uuid: string;
  version: string;
  text: string;
}

/** A global reference (GlobalReferenceType): type, refObjectId, version, uri, and a short description. */
function reference(parent: Node, name: string, ref: Ref): Node {
  const node = el(parent, name, undefined, { type: ref.type, refObjectId: ref.uuid, ...(ref.version ? { version: ref.version } : {}), ...(ref.folder ? { uri: `../${ref.folder}/${ref.uuid}.xml` } : {}) });
  lang(node, 'common:shortDescription', ref.text);
  return node;
}

const publishedSourceRef = (source: Reference): Ref => ({ type: 'source data set', uuid: source.uuid, version: source.version, text: source.name });
const unitGroupRef = (group: UnitGroup): Ref => ({ folder: 'unitgroups', type: 'unit group data set', uuid: group.uuid, version: group.version, text: group.name || group.unit });
const propertyRef = (property: FlowProperty): Ref => ({ folder: 'flowproperties', type: 'flow property data set', uuid: property.uuid, version: property.version, text: property.name });

/** The administrative part every dataset has: when entered (the declaration's issue date), in which format, which version, and (where given) whose. */
function administrative(parent: Node, declaration: Declaration, owner?: Ref): void {
  const admin = el(parent, 'administrativeInformation');
  const entry = el(admin, 'dataEntryBy');
  el(entry, 'common:timeStamp', `${declaration.issued}T00:00:00Z`);
  reference(entry, 'common:referenceToDataSetFormat', publishedSourceRef(SOURCES.ilcdFormat));
  const publication = el(admin, 'publicationAndOwnership');
  el(publication, 'common:dataSetVersion', DATASET_VERSION);
  if (owner) reference(publication, 'common:referenceToOwnershipOfDataSet', owner);
}

/** The datasets of one declaration that every product's archive shares, by path. */
const SHARED = new WeakMap<Declaration, Map<string, string>>();

/** Every dataset of one declaration's archive, sorted by path. */
export function ilcdDatasets(declaration: Declaration, exported: ExportedDeclaration): IlcdFile[] {
  const owner = declaration.owner;
  const ids = { kind: exported.kind, id: exported.id, owner: owner.name };
  const uuid = (...names: string[]) => datasetUuid(ids.owner, ids.kind, ids.id, ...names);
  const processUuid = processUuidOf(declaration, exported.kind, exported.id);
  const files: IlcdFile[] = [];
  const add = (folder: Folder, id: string, doc: Doc) => files.push({ path: `ILCD/${folder}/${id}.xml`, xml: doc.text() });
  // Datasets that depend on the declaration alone (contacts, the PCR and background sources, flow properties, unit groups) are made once per build.
  let cache = SHARED.get(declaration);
  if (!cache) SHARED.set(declaration, (cache = new Map()));
  const shared = (folder: Folder, id: string, make: () => Doc) => {
    const path = `ILCD/${folder}/${id}.xml`;
    let xml = cache.get(path);
    if (xml === undefined) cache.set(path, (xml = make().text()));
    files.push({ path, xml });
  };

  // Contacts: the owner, and the verifier once verified.
  const ownerRef: Ref = { folder: 'contacts', type: 'contact data set', uuid: datasetUuid('contact', owner.name), version: DATASET_VERSION, text: owner.name };
  shared('contacts', ownerRef.uuid, () => contactDataset(declaration, ownerRef, { name: owner.name, address: owner.address, contact: owner.contact }));
  const verification = exported.verification;
  const verified = verification.status === 'verified' && verification.verifier !== undefined;
  const verifierRef: Ref | undefined = verified ? { folder: 'contacts', type: 'contact data set', uuid: datasetUuid('contact', verification.verifier!), version: DATASET_VERSION, text: verification.verifier! } : undefined;
  if (verifierRef) shared('contacts', verifierRef.uuid, () => contactDataset(declaration, verifierRef, { name: verifierRef.text }));

  // Sources: the PCR, each background database, and the verification.
  const pcrRef: Ref = { folder: 'sources', type: 'source data set', uuid: datasetUuid('pcr', declaration.pcr), version: DATASET_VERSION, text: declaration.pcr };
  shared('sources', pcrRef.uuid, () => sourceDataset(declaration, pcrRef, declaration.pcr, 'Undefined'));
  const backgroundRefs = declaration.background_data.map((data): Ref => {
    const text = `${data.name} ${data.version}`;
    const ref: Ref = { folder: 'sources', type: 'source data set', uuid: datasetUuid('background', data.name, data.version), version: DATASET_VERSION, text };
    shared('sources', ref.uuid, () => sourceDataset(declaration, ref, data.licence ? `${text}; licence: ${data.licence}` : text, 'Undefined'));
    return ref;
  });
  const reviewRef: Ref | undefined = verified
    ? { folder: 'sources', type: 'source data set', uuid: uuid('verification', verification.verifier!, verification.date ?? ''), version: DATASET_VERSION, text: `Verification of ${exported.name} by ${verification.verifier}${verification.date ? `, ${verification.date}` : ''}` }
    : undefined;
  if (reviewRef) add('sources', reviewRef.uuid, sourceDataset(declaration, reviewRef, `${reviewRef.text} (independent verification under ISO 14025 and ${declaration.standard})`, 'Undefined'));

  // The product flow: declared unit, mass per declared unit, biogenic carbon.
  const quantity = declaredQuantity(exported.declaredUnit);
  const flowRef: Ref = { folder: 'flows', type: 'flow data set', uuid: uuid('flow'), version: DATASET_VERSION, text: exported.name };
  const properties = [quantity.property, ...(quantity.property.uuid === MASS.uuid ? [] : [MASS]), BIOGENIC_CARBON, BIOGENIC_CARBON_PACKAGING];
  add('flows', flowRef.uuid, flowDataset(declaration, exported, flowRef, ownerRef, quantity));

  // The flow properties and unit groups the flow and the indicators use.
  const groups = new Map<string, UnitGroup>();
  for (const property of properties) {
    shared('flowproperties', property.uuid, () => flowPropertyDataset(declaration, property));
    groups.set(property.unitGroup.uuid, property.unitGroup);
  }
  for (const indicator of exported.indicators) {
    const published = findIndicator(indicator.code);
    if (published?.unitGroupUuid && !groups.has(published.unitGroupUuid)) groups.set(published.unitGroupUuid, { uuid: published.unitGroupUuid, version: '', name: `Units of ${published.unit}`, unit: published.unit });
  }
  for (const group of groups.values()) shared('unitgroups', group.uuid, () => unitGroupDataset(declaration, group));

  add('processes', processUuid, processDataset(declaration, exported, { uuid: processUuid, owner: ownerRef, verifier: verifierRef, pcr: pcrRef, background: backgroundRefs, review: reviewRef, flow: flowRef, quantity }));
  return files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}

function contactDataset(declaration: Declaration, ref: Ref, contact: { name: string; address?: string | undefined; contact?: string | undefined }): Doc {
  const doc = new Doc(NS.contact, 'contactDataSet');
  const info = el(el(doc.root, 'contactInformation'), 'dataSetInformation');
  el(info, 'common:UUID', ref.uuid);
  lang(info, 'common:shortName', contact.name);
  lang(info, 'common:name', contact.name);
  if (contact.address) lang(info, 'contactAddress', contact.address);
  if (contact.contact && /^[^\s@]+@[^\s@]+$/.test(contact.contact)) el(info, 'email', contact.contact);
  else if (contact.contact) lang(info, 'contactDescriptionOrComment', contact.contact);
  administrative(doc.root, declaration);
  return doc;
}

function sourceDataset(declaration: Declaration, ref: Ref, citation: string, publicationType: string): Doc {
  const doc = new Doc(NS.source, 'sourceDataSet');
  const info = el(el(doc.root, 'sourceInformation'), 'dataSetInformation');
  el(info, 'common:UUID', ref.uuid);
  lang(info, 'common:shortName', ref.text);
  el(info, 'sourceCitation', citation);
  el(info, 'publicationType', publicationType);
  administrative(doc.root, declaration);
  return doc;
}

/** A reference dataset (unit group, flow property) up to its information element: UUID and English name. */
function referenceDataset(ns: string, rootName: string, informationName: string, uuid: string, name: string): { doc: Doc; information: Node } {
  const doc = new Doc(ns, rootName);
  const information = el(doc.root, informationName);
  const info = el(information, 'dataSetInformation');
  el(info, 'common:UUID', uuid);
  lang(info, 'common:name', name);
  return { doc, information };
}

function unitGroupDataset(declaration: Declaration, group: UnitGroup): Doc {
  const { doc, information } = referenceDataset(NS.unitGroup, 'unitGroupDataSet', 'unitGroupInformation', group.uuid, group.name || `Units of ${group.unit}`);
  el(el(information, 'quantitativeReference'), 'referenceToReferenceUnit', '0');
  administrative(doc.root, declaration);
  const unit = el(el(doc.root, 'units'), 'unit', undefined, { dataSetInternalID: '0' });
  el(unit, 'name', group.unit);
  el(unit, 'meanValue', 1);
  return doc;
}

function flowPropertyDataset(declaration: Declaration, property: FlowProperty): Doc {
  const { doc, information } = referenceDataset(NS.flowProperty, 'flowPropertyDataSet', 'flowPropertiesInformation', property.uuid, property.name);
  reference(el(information, 'quantitativeReference'), 'referenceToReferenceUnitGroup', unitGroupRef(property.unitGroup));
  administrative(doc.root, declaration);
  return doc;
}

function flowDataset(declaration: Declaration, exported: ExportedDeclaration, ref: Ref, owner: Ref, quantity: { amount: number; property: FlowProperty }): Doc {
  const doc = new Doc(NS.flow, 'flowDataSet', { epd: NS.epd, mat: NS.mat });
  const information = el(doc.root, 'flowInformation');
  const info = el(information, 'dataSetInformation');
  el(info, 'common:UUID', ref.uuid);
  lang(el(info, 'name'), 'baseName', exported.name);
  if (exported.description) lang(info, 'common:generalComment', exported.description);
  // The conversion of one declared unit to 1 kg, as the format's MatML property "conversion factor to 1 kg":
  // the factor that turns a value per declared unit into a value per kg (1 / kg per declared unit).
  const other = el(info, 'common:other');
  const matml = el(other, 'mat:MatML_Doc');
  const bulk = el(el(matml, 'mat:Material'), 'mat:BulkDetails');
  el(bulk, 'mat:Name', exported.name);
  el(el(bulk, 'mat:PropertyData', undefined, { property: 'pr1' }), 'mat:Data', String(1 / exported.unitMassKg), { format: 'float' });
  const details = el(el(matml, 'mat:Metadata'), 'mat:PropertyDetails', undefined, { id: 'pr1' });
  el(details, 'mat:Name', 'conversion factor to 1 kg');
  el(el(el(details, 'mat:Units', undefined, { name: '-', description: 'none' }), 'mat:Unit'), 'mat:Name', '-');
  el(el(information, 'quantitativeReference'), 'referenceToReferenceFlowProperty', '0');
  el(el(el(doc.root, 'modellingAndValidation'), 'LCIMethod'), 'typeOfDataSet', 'Product flow');
  administrative(doc.root, declaration, owner);
  // Flow properties: each meanValue is that property per one reference unit of the reference property.
  const list = el(doc.root, 'flowProperties');
  const property = (id: number, p: FlowProperty, value: number) => {
    const node = el(list, 'flowProperty', undefined, { dataSetInternalID: String(id) });
    reference(node, 'referenceToFlowPropertyDataSet', propertyRef(p));
    el(node, 'meanValue', value);
  };
  let id = 0;
  property(id++, quantity.property, 1);
  // kg per reference unit: the declared unit's mass spread over its amount of the reference property.
  if (quantity.property.uuid !== MASS.uuid) property(id++, MASS, exported.unitMassKg / quantity.amount);
  // Biogenic carbon per reference unit, where known (EN 15804+A2 §7.2.3; never written as 0 when not available).
  if (exported.biogenicCarbonKg.product !== null) property(id++, BIOGENIC_CARBON, exported.biogenicCarbonKg.product / quantity.amount);
  if (exported.biogenicCarbonKg.packaging !== null) property(id++, BIOGENIC_CARBON_PACKAGING, exported.biogenicCarbonKg.packaging / quantity.amount);
  return doc;
}

interface ProcessRefs {
  uuid: string;
  owner: Ref;
  verifier: Ref | undefined;
  pcr: Ref;
  background: Ref[];
  review: Ref | undefined;
  flow: Ref;
  quantity: { amount: number; property: FlowProperty };
}

/** The cautions every exported declaration carries, as the pages do (field guide §6). */
export function exportCautions(declaration: Declaration, verified: boolean): string[] {
  return [
    ...(declaration.illustrative ? ['ILLUSTRATIVE: the data behind this dataset are invented (a demo or training project); do not use its values for any claim.'] : []),
    ...(verified
      ? []
      : ['Not verified: this declaration is not valid as a public environmental claim until an independent verifier has verified it under ISO 14025, the applicable PCR and the programme rules.']),
    `Results depend on the background data (${declaration.background_data.map((data) => `${data.name} ${data.version}`).join('; ')}) and the PCR (${declaration.pcr}); they are not comparable across PCRs.`,
  ];
}

function processDataset(declaration: Declaration, exported: ExportedDeclaration, refs: ProcessRefs): Doc {
  const doc = new Doc(NS.process, 'processDataSet', { epd: NS.epd, epd2: NS.epd2, epd24: NS.epd24 });
  doc.root.attrs['epd2:epd-version'] = EPD_FORMAT_VERSION;
  const information = el(doc.root, 'processInformation');
  const info = el(information, 'dataSetInformation');
  el(info, 'common:UUID', refs.uuid);
  lang(el(info, 'name'), 'baseName', exported.name);
  const members = exported.members?.length ? ` Average of ${exported.members.length} products weighted by production: ${exported.members.map((m) => `${m.id} (${(m.share * 100).toFixed(1)} %)`).join(', ')}.` : '';
  lang(info, 'common:generalComment', `${exported.kind === 'family' ? 'Family' : 'Product'} ${exported.id}. ${sentence(exported.description)}${members} ${exportCautions(declaration, refs.verifier !== undefined).join(' ')} Written by ${TOOL_NAME} ${TOOL_VERSION}.`.replace(/\s+/g, ' ').trim());
  const eol = exported.endOfLife;
  if (eol) {
    const other = el(info, 'common:other');
    const scenarios = el(other, 'epd:scenarios');
    const scenario = el(scenarios, 'epd:scenario', undefined, { 'epd:name': eol.name, 'epd:group': 'EoL', 'epd:default': 'true' });
    const pct = (share: number) => `${(share * 100).toFixed(1)} %`;
    el(
      scenario,
      'epd:description',
      `End-of-life scenario ${eol.name} (C1–C4, D): of the product's mass, ${pct(eol.separate)} collected separately and ${pct(eol.withMixedWaste)} with mixed waste; ${pct(eol.reuse)} re-used, ${pct(eol.recycling)} recycled, ${pct(eol.energyRecovery)} to energy recovery, ${pct(eol.incineration)} incinerated without energy recovery, ${pct(eol.landfill)} landfilled.`,
    );
    const data = el(el(other, 'epd24:scenarioData'), 'epd24:eolScenarioData', undefined, { 'epd24:scenario': eol.name });
    el(data, 'epd24:collection', undefined, { 'epd24:separate': double(eol.separate), 'epd24:withMixedWaste': double(eol.withMixedWaste) });
    el(data, 'epd24:recovery', undefined, { 'epd24:reuse': double(eol.reuse), 'epd24:recycling': double(eol.recycling), 'epd24:energyRecovery': double(eol.energyRecovery) });
    el(data, 'epd24:disposal', undefined, { 'epd24:finalDeposition': double(eol.landfill) });
  }
  el(el(information, 'quantitativeReference', undefined, { type: 'Reference flow(s)' }), 'referenceToReferenceFlow', '0');
  const time = el(information, 'time');
  el(time, 'common:referenceYear', String(declaration.reference_year));
  el(time, 'common:dataSetValidUntil', declaration.valid_until.slice(0, 4));
  const timeOther = el(time, 'common:other');
  el(timeOther, 'epd2:publicationDateOfEPD', declaration.issued);
  el(timeOther, 'epd24:expirationDateOfEPD', declaration.valid_until);

  const modelling = el(doc.root, 'modellingAndValidation');
  const method = el(modelling, 'LCIMethodAndAllocation');
  el(method, 'typeOfDataSet', 'EPD');
  reference(method, 'referenceToLCAMethodDetails', refs.pcr);
  el(el(method, 'common:other'), 'epd:subType', exported.kind === 'family' ? 'average dataset' : 'specific dataset');
  const sources = el(modelling, 'dataSourcesTreatmentAndRepresentativeness');
  for (const ref of refs.background) reference(sources, 'referenceToDataSource', ref);
  lang(sources, 'useAdviceForDataSet', exportCautions(declaration, refs.verifier !== undefined).join(' '));
  const review = el(el(modelling, 'validation'), 'review', undefined, { type: refs.verifier ? 'Independent external review' : 'Not reviewed' });
  if (refs.verifier) reference(review, 'common:referenceToNameOfReviewerAndInstitution', refs.verifier);
  if (refs.review) reference(review, 'common:referenceToCompleteReviewReport', refs.review);
  const compliance = el(el(modelling, 'complianceDeclarations'), 'compliance');
  reference(compliance, 'common:referenceToComplianceSystem', publishedSourceRef(SOURCES.en15804A2Ef31));

  const admin = el(doc.root, 'administrativeInformation');
  reference(el(admin, 'common:commissionerAndGoal'), 'common:referenceToCommissioner', refs.owner);
  const entry = el(admin, 'dataEntryBy');
  el(entry, 'common:timeStamp', `${declaration.issued}T00:00:00Z`);
  reference(entry, 'common:referenceToDataSetFormat', publishedSourceRef(SOURCES.ilcdFormat));
  reference(entry, 'common:referenceToDataSetFormat', publishedSourceRef(SOURCES.epdExtensions));
  const publication = el(admin, 'publicationAndOwnership');
  el(publication, 'common:dataSetVersion', DATASET_VERSION);
  reference(publication, 'common:referenceToOwnershipOfDataSet', refs.owner);

  const modules = exportedModules(exported.modules);
  const amounts = (parent: Node, code: string, unitGroupUuid: string | undefined, unit: string) => {
    const other = el(parent, 'common:other');
    for (const module of modules) {
      const value = exported.modules[module]?.[code];
      // A value not available is left out, never written as 0.
      if (value === null || value === undefined) continue;
      el(other, 'epd:amount', value, { 'epd:module': module, ...(eol && /^[CD]/.test(module) ? { 'epd:scenario': eol.name } : {}) });
    }
    if (unitGroupUuid) reference(other, 'epd:referenceToUnitGroupDataSet', { folder: 'unitgroups', type: 'unit group data set', uuid: unitGroupUuid, version: '', text: unit });
  };
  const exchanges = el(doc.root, 'exchanges');
  const product = el(exchanges, 'exchange', undefined, { dataSetInternalID: '0' });
  reference(product, 'referenceToFlowDataSet', refs.flow);
  el(product, 'exchangeDirection', 'Output');
  el(product, 'meanAmount', refs.quantity.amount);
  const published = exported.indicators.map((indicator) => ({ indicator, entry: findIndicator(indicator.code) })).filter(({ entry }) => entry?.uuid);
  let internal = 1;
  for (const { indicator, entry } of published.filter(({ indicator }) => !isImpactIndicator(indicator.code))) {
    const exchange = el(exchanges, 'exchange', undefined, { dataSetInternalID: String(internal++) });
    reference(exchange, 'referenceToFlowDataSet', { type: 'flow data set', uuid: entry!.uuid!, version: entry!.version ?? '', text: `${entry!.name} (${indicator.code})` });
    el(exchange, 'exchangeDirection', exchangeDirection(indicator.code));
    el(exchange, 'meanAmount', 0);
    amounts(exchange, indicator.code, entry!.unitGroupUuid, entry!.unit);
  }
  const impacts = published.filter(({ indicator }) => isImpactIndicator(indicator.code));
  if (impacts.length) {
    const results = el(doc.root, 'LCIAResults');
    for (const { indicator, entry } of impacts) {
      const result = el(results, 'LCIAResult');
      reference(result, 'referenceToLCIAMethodDataSet', { type: 'LCIA method data set', uuid: entry!.uuid!, version: entry!.version ?? '', text: `${entry!.name} (${indicator.code})` });
      el(result, 'meanAmount', 0);
      amounts(result, indicator.code, entry!.unitGroupUuid, entry!.unit);
    }
  }
  return doc;
}
