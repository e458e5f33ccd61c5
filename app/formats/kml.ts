// KML 2.2 (OGC 07-147r2): the plan's results written as folders of placemarks, and sites read
// from placemarks.
import { kmlGen } from '@tmcw/togeojson';
import { DOMParser as XmldomParser } from '@xmldom/xmldom';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import { el, releaseText, signed, xmlEscape } from './export-shared';
import {
  type GeoJSONOptions,
  type Geometry,
  type Position,
  readFeatures,
  toGeoJSON,
} from './geojson';
import {
  clip,
  type ImportOptions,
  type ImportProblem,
  type ReadTarget,
  type XmlParser,
} from './site-reading';

/** KML colour aabbggrr from '#rrggbb' and an opacity 0…1 (KML 2.2 §16.9 kml:color). */
export function kmlColor(hex: string, alpha = 1): string {
  const a = Math.round(alpha * 255)
    .toString(16)
    .padStart(2, '0');
  return `${a}${hex.slice(5, 7)}${hex.slice(3, 5)}${hex.slice(1, 3)}`;
}

// Seedfall's own palette.
export const STYLES: Record<string, string> = {
  'sf-site': `<IconStyle><color>${kmlColor('#1b6e5a')}</color><scale>1.1</scale></IconStyle>`,
  'sf-release': `<IconStyle><color>${kmlColor('#c2410c')}</color><scale>0.9</scale></IconStyle>`,
  'sf-landing': `<IconStyle><color>${kmlColor('#6b7280')}</color><scale>0.6</scale></IconStyle>`,
  'sf-ellipse50': `<LineStyle><color>${kmlColor('#7c3aed')}</color><width>1</width></LineStyle><PolyStyle><color>${kmlColor('#7c3aed', 0.35)}</color></PolyStyle>`,
  'sf-ellipse95': `<LineStyle><color>${kmlColor('#7c3aed')}</color><width>1.5</width></LineStyle><PolyStyle><color>${kmlColor('#7c3aed', 0.12)}</color></PolyStyle>`,
  'sf-reach': `<LineStyle><color>${kmlColor('#0e7490')}</color><width>1.5</width></LineStyle><PolyStyle><color>${kmlColor('#0e7490', 0.06)}</color></PolyStyle>`,
  'sf-window': `<LineStyle><color>${kmlColor('#c2410c', 0.8)}</color><width>6</width></LineStyle>`,
  'sf-zone': `<LineStyle><color>${kmlColor('#c2410c')}</color><width>2</width></LineStyle><PolyStyle><color>${kmlColor('#c2410c', 0.08)}</color></PolyStyle>`,
  'sf-track': `<LineStyle><color>${kmlColor('#334155')}</color><width>2</width></LineStyle>`,
  'sf-hazard': `<LineStyle><color>${kmlColor('#b42318')}</color><width>2.5</width></LineStyle><PolyStyle><color>${kmlColor('#b42318', 0.08)}</color></PolyStyle>`,
};

export const kmlCoords = (ps: Position[]): string => ps.map((p) => `${p[0]},${p[1]}`).join(' ');

export function kmlGeometry(g: Geometry): string {
  switch (g.type) {
    case 'Point':
      return `<Point><coordinates>${kmlCoords([g.coordinates])}</coordinates></Point>`;
    case 'LineString':
      return `<LineString><tessellate>1</tessellate><coordinates>${kmlCoords(g.coordinates)}</coordinates></LineString>`;
    case 'Polygon': {
      const [outer, ...holes] = g.coordinates;
      const ring = (r: Position[]): string =>
        `<LinearRing><coordinates>${kmlCoords(r)}</coordinates></LinearRing>`;
      return `<Polygon><outerBoundaryIs>${ring(outer)}</outerBoundaryIs>${holes.map((h) => `<innerBoundaryIs>${ring(h)}</innerBoundaryIs>`).join('')}</Polygon>`;
    }
    default:
      return `<MultiGeometry>${g.coordinates.map((c) => kmlGeometry({ type: 'Polygon', coordinates: c })).join('')}</MultiGeometry>`;
  }
}

export function placemark(
  name: string,
  description: string,
  style: string,
  data: Record<string, unknown>,
  g: Geometry,
): string {
  // Element order of kml:Placemark per the KML 2.2 schema: name, description, styleUrl, ExtendedData, Geometry.
  const ext = Object.entries(data)
    .filter(([, v]) => v !== undefined && v !== null)
    .map(([k, v]) => `<Data name="${xmlEscape(k)}"><value>${xmlEscape(String(v))}</value></Data>`)
    .join('');
  return `<Placemark>${el('name', name)}${el('description', description)}<styleUrl>#${style}</styleUrl><ExtendedData>${ext}</ExtendedData>${kmlGeometry(g)}</Placemark>`;
}

export const FOLDERS: [string, string[]][] = [
  ['Sites', ['site']],
  ['Release points', ['release']],
  ['Landing ellipses', ['landing', 'ellipse50', 'ellipse95']],
  ['Reach areas', ['reach']],
  ['Release windows', ['window', 'zone']],
  ['Track', ['track']],
  ['Hazard area', ['hazard']],
];

export const KIND_TITLE: Record<string, string> = {
  landing: 'uncontrolled landing',
  ellipse50: '50 % landing ellipse',
  ellipse95: '95 % landing ellipse',
  reach: 'reach area',
  window: 'release window',
  zone: 'hover release zone',
};

/** KML 2.2 document with one Folder per layer; numbers in ExtendedData and descriptions. */
export function toKML(plan: Plan, result: PlanResult, opts: GeoJSONOptions = {}): string {
  const fc = toGeoJSON(plan, result, opts);
  const byId = new Map(result.sites.map((s) => [s.id, s]));
  const body = FOLDERS.map(([title, kinds]) => {
    const marks = fc.features
      .filter((f) => kinds.includes(String(f.properties.kind)))
      .map((f) => {
        const p = f.properties;
        const kind = String(p.kind);
        const r = byId.get(String(p.site ?? p.id));
        if (kind === 'site' && r) {
          const text = `${r.name} (${r.id}): ${releaseText(r)}; tolerance ${String(p.tolerance_m)} m, elevation ${String(p.elevation_m)} m`;
          return placemark(r.name, text, 'sf-site', p, f.geometry);
        }
        if (kind === 'release' && r)
          return placemark(`R-${r.id}`, releaseText(r), 'sf-release', p, f.geometry);
        if (kind === 'hazard') {
          return placemark(
            'Hazard area — keep people clear',
            'hazard area of the plan',
            'sf-hazard',
            p,
            f.geometry,
          );
        }
        if (kind === 'track') {
          const text = `carrier track ${String(p.trackDeg)}° true at ${String(p.groundSpeed_mps)} m/s, ${signed(Number(p.from_s))} to ${signed(Number(p.to_s))} about the plan's release point`;
          return placemark('Carrier track', text, 'sf-track', p, f.geometry);
        }
        const text = Object.entries(p)
          .filter(([k]) => k !== 'kind')
          .map(([k, v]) => `${k} ${String(v)}`)
          .join(', ');
        return placemark(
          `${String(p.site)} ${kind === 'reach' && p.ground === 'terrain' ? `${String(p.variant)} ` : ''}${KIND_TITLE[kind] ?? kind}`,
          text,
          `sf-${kind}`,
          p,
          f.geometry,
        );
      });
    return `<Folder>${el('name', title)}${marks.join('\n')}</Folder>`;
  });
  const styles = Object.entries(STYLES).map(([id, s]) => `<Style id="${id}">${s}</Style>`);
  const desc = `Seedfall plan, release ${result.time}; release altitude ${result.releaseAltitudeMSL_m.toFixed(1)} m MSL`;
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<kml xmlns="http://www.opengis.net/kml/2.2">',
    `<Document>${el('name', result.name)}${el('description', desc)}`,
    ...styles,
    ...body,
    '</Document>',
    '</kml>',
    '',
  ].join('\n');
}

export function defaultParser(onError: (line: number | undefined, msg: string) => void): XmlParser {
  const native = (globalThis as { DOMParser?: typeof DOMParser }).DOMParser;
  if (native) return (t) => new native().parseFromString(t, 'application/xml');
  return (t) => {
    const parser = new XmldomParser({
      onError: (level, msg, ctx) => {
        const loc = (ctx as { locator?: { lineNumber?: number } } | undefined)?.locator;
        onError(loc?.lineNumber, `XML ${level === 'warning' ? 'warning' : 'error'}: ${msg}`);
      },
    });
    return parser.parseFromString(t, 'text/xml') as unknown as Document;
  };
}

export function readKML(text: string, opts: ImportOptions, to: ReadTarget): void {
  const { ids, sink, problems } = to;
  const xmlProblems: ImportProblem[] = [];
  const note = (line: number | undefined, msg: string): void => {
    xmlProblems.push(line ? { line, message: `line ${line}: ${msg}` } : { message: msg });
  };
  const parse = opts.parseXml ?? defaultParser(note);
  let doc: Document;
  try {
    doc = parse(text);
  } catch (e) {
    const err = e as { message?: string; locator?: { lineNumber?: number } };
    if (xmlProblems.length === 0)
      note(err.locator?.lineNumber, `XML error: ${err.message ?? String(e)}`);
    problems.push(...xmlProblems);
    return;
  }
  problems.push(...xmlProblems);
  const perr = doc?.getElementsByTagName?.('parsererror');
  if (!doc || !doc.documentElement || (perr && perr.length > 0)) {
    const why = perr?.[0]?.textContent?.trim().split('\n')[0];
    problems.push({ message: `not well-formed XML${why ? ` (${clip(why, 160)})` : ''}` });
    return;
  }
  const root = doc.documentElement.localName ?? doc.documentElement.nodeName;
  if (root !== 'kml') {
    problems.push({ message: `root element <${root}> is not <kml>; only KML 2.2 is read` });
    return;
  }
  // Placemarks stream out of togeojson; reading stops when the plan is full.
  readFeatures(kmlGen(withoutKmlPrefix(doc) as Parameters<typeof kmlGen>[0]), ids, sink, problems);
}

/** KML 2.2 and the older Google Earth namespaces. */
export const isKmlNs = (ns: string | null): boolean => ns !== null && /kml/i.test(ns);

/**
 * The document with its KML elements unprefixed (`<kml:Placemark>` → `<Placemark>`), since
 * togeojson finds elements by their qualified name. Copied without recursion (deep files).
 */
export function withoutKmlPrefix(doc: Document): Document {
  const root = doc.documentElement;
  const prefixed =
    !!root.prefix ||
    doc.getElementsByTagNameNS('*', 'Placemark').length >
      doc.getElementsByTagName('Placemark').length;
  if (!prefixed) return doc;
  const out = doc.implementation.createDocument(root.namespaceURI, root.localName, null);
  const stack: [Node, Node][] = [];
  const copyAttrs = (from: Element, to: Element): void => {
    for (let a = 0; a < from.attributes.length; a++) {
      const at = from.attributes[a];
      if (!/^xmlns(:|$)/.test(at.name)) to.setAttribute(at.name, at.value);
    }
  };
  copyAttrs(root, out.documentElement);
  for (let c = root.firstChild; c; c = c.nextSibling) stack.push([c, out.documentElement]);
  stack.reverse();
  while (stack.length > 0) {
    const [node, parent] = stack.pop()!;
    if (node.nodeType === 1) {
      const el = node as Element;
      const copy = out.createElementNS(
        el.namespaceURI,
        isKmlNs(el.namespaceURI) ? el.localName : el.nodeName,
      );
      copyAttrs(el, copy);
      parent.appendChild(copy);
      const kids: [Node, Node][] = [];
      for (let c = el.firstChild; c; c = c.nextSibling) kids.push([c, copy]);
      for (let k = kids.length - 1; k >= 0; k--) stack.push(kids[k]);
    } else if (node.nodeType === 3 || node.nodeType === 4) {
      parent.appendChild(out.createTextNode(node.nodeValue ?? ''));
    }
  }
  return out;
}
