import { SaxesParser } from 'saxes';

/**
 * XML read into a small tree that remembers where each element starts (line and column, as an
 * editor shows them), so a value read from a supplier's dataset can be cited down to its
 * element. Parsed with saxes (namespace-aware, well-formedness checked, no DTDs or external
 * entities fetched); names are kept as namespace URI and local name.
 */
export interface XmlElement {
  ns: string;
  name: string;
  /** Attributes by `{namespace}local` (an attribute with no prefix has no namespace: just `local`). */
  attrs: Record<string, string>;
  children: XmlElement[];
  /** The element's own text, trimmed. */
  text: string;
  line: number;
  column: number;
}

export class XmlSyntaxError extends Error {
  constructor(
    message: string,
    readonly line: number,
    readonly column: number,
  ) {
    super(message);
  }
}

const key = (uri: string, local: string) => (uri ? `{${uri}}${local}` : local);

/** Parses a document; throws XmlSyntaxError with the line and column of the first error. */
export function parseXml(text: string): XmlElement {
  const parser = new SaxesParser({ xmlns: true, position: true });
  const stack: XmlElement[] = [];
  let root: XmlElement | undefined;
  let failure: XmlSyntaxError | undefined;
  let start = { line: 1, column: 1 };
  parser.on('error', (error) => {
    if (!failure) failure = new XmlSyntaxError(error.message.replace(/^(?:[^:]*:)?\d+:\d+: /, ''), parser.line, parser.column);
  });
  parser.on('text', (text) => {
    const top = stack[stack.length - 1];
    if (top) top.text += text;
  });
  parser.on('cdata', (text) => {
    const top = stack[stack.length - 1];
    if (top) top.text += text;
  });
  // When the tag's name has been read, saxes is just past it: the tag's "<" is the name's length and one character back.
  parser.on('opentagstart', (tag) => (start = { line: parser.line, column: parser.column - tag.name.length - 1 }));
  parser.on('opentag', (tag) => {
    const attrs: Record<string, string> = {};
    for (const attr of Object.values(tag.attributes)) {
      if (attr.prefix === 'xmlns' || attr.name === 'xmlns') continue;
      attrs[key(attr.uri, attr.local)] = attr.value;
    }
    const element: XmlElement = { ns: tag.uri ?? '', name: tag.local ?? tag.name, attrs, children: [], text: '', line: start.line, column: start.column };
    const parent = stack[stack.length - 1];
    if (parent) parent.children.push(element);
    else root = element;
    if (!tag.isSelfClosing) stack.push(element);
  });
  parser.on('closetag', (tag) => {
    if (!tag.isSelfClosing) {
      const element = stack.pop();
      if (element) element.text = element.text.trim();
    }
  });
  parser.on('doctype', () => {
    if (!failure) failure = new XmlSyntaxError('a document type declaration is not allowed in a dataset', parser.line, parser.column);
  });
  try {
    parser.write(text).close();
  } catch (error) {
    if (!failure) failure = new XmlSyntaxError((error as Error).message, parser.line, parser.column);
  }
  if (failure) throw failure;
  if (!root) throw new XmlSyntaxError('the document has no root element', 1, 1);
  return root;
}

/** The children of an element with a namespace and local name. */
export const childrenOf = (element: XmlElement | undefined, ns: string, name: string): XmlElement[] => element?.children.filter((child) => child.ns === ns && child.name === name) ?? [];
/** The first child with a namespace and local name. */
export const childOf = (element: XmlElement | undefined, ns: string, name: string): XmlElement | undefined => element?.children.find((child) => child.ns === ns && child.name === name);
/** Follows a path of [namespace, name] steps from an element, first child at each step. */
export function pathOf(element: XmlElement | undefined, ...steps: Array<[string, string]>): XmlElement | undefined {
  let at = element;
  for (const [ns, name] of steps) at = childOf(at, ns, name);
  return at;
}
/** An attribute by namespace (empty: none) and local name. */
export const attrOf = (element: XmlElement | undefined, ns: string, name: string): string | undefined => element?.attrs[key(ns, name)];
