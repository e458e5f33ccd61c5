// A site's position from CSV cells: decimal degrees, DMS, UTM or MGRS.
import { fromUTM, parseCoordinate } from '../model';
import type { Col } from './csv-layout';
import { checkLatLon, clip, toNumber } from './site-reading';

export type Pos = { lat: number; lon: number } | { message: string };

export function angle(cell: string, axis: 'lat' | 'lon', dc: boolean): number | string {
  const n = toNumber(cell, dc);
  if (n !== undefined) return n;
  const word = axis === 'lat' ? 'latitude' : 'longitude';
  const t = dc ? cell.replace(/(\d),(\d)/g, '$1.$2') : cell;
  if (/[EW]/i.test(t) && axis === 'lat')
    return `latitude "${clip(cell)}" names an east/west hemisphere`;
  if (/[NS]/i.test(t) && axis === 'lon')
    return `longitude "${clip(cell)}" names a north/south hemisphere`;
  // Pair it with a zero of the other axis so parseCoordinate reads one degrees-minutes-seconds angle.
  const r = parseCoordinate(axis === 'lat' ? `${t}, 0` : `0, ${t}`);
  if (r.ok) return axis === 'lat' ? r.lat : r.lon;
  if (/ is not in /.test(r.message.split(';')[0]))
    return `${word} "${clip(cell)}" out of range ${axis === 'lat' ? '-90…90' : '-180…180'}`;
  return `${word} "${clip(cell)}" is not a number or a degrees-minutes-seconds angle`;
}

export function csvPosition(get: (c: Col) => string, cols: Map<Col, number>, dc: boolean): Pos {
  const lat = get('lat');
  const lon = get('lon');
  if (lat !== '' || lon !== '') {
    if (lat === '') return { message: 'latitude is empty' };
    if (lon === '') return { message: 'longitude is empty' };
    const a = angle(lat, 'lat', dc);
    if (typeof a === 'string') return { message: a };
    const b = angle(lon, 'lon', dc);
    if (typeof b === 'string') return { message: b };
    const err = checkLatLon(a, b, lat, lon);
    return err ? { message: err } : { lat: a, lon: b };
  }
  const m = get('mgrs');
  if (m !== '') {
    const r = parseCoordinate(m);
    if (!r.ok || !/^\d{1,2}\s*[C-HJ-NP-X]\s*[A-Z]{2}/i.test(m))
      return {
        message: `MGRS "${clip(m)}" is not valid${r.ok ? '' : ` (${r.message.split(';')[0]})`}`,
      };
    return { lat: r.lat, lon: r.lon };
  }
  const e = get('easting');
  const n = get('northing');
  const z = get('zone');
  if (e !== '' || n !== '' || (z !== '' && cols.has('easting')))
    return utmPosition(e, n, z, get('hemisphere'), get('band'), dc);
  const p = get('position');
  if (p !== '') {
    const r = parseCoordinate(dc ? p.replace(/(\d),(\d)/g, '$1.$2') : p);
    return r.ok
      ? { lat: r.lat, lon: r.lon }
      : { message: `position "${clip(p)}": ${r.message.split(';')[0]}` };
  }
  return { message: 'no coordinates' };
}

export function utmPosition(
  e: string,
  n: string,
  z: string,
  hemi: string,
  band: string,
  dc: boolean,
): Pos {
  const easting = toNumber(e, dc);
  const northing = toNumber(n, dc);
  if (easting === undefined) return { message: `UTM easting "${clip(e)}" is not a number` };
  if (northing === undefined) return { message: `UTM northing "${clip(n)}" is not a number` };
  const zm = /^(\d{1,2})\s*([A-Za-z])?$/.exec(z);
  if (!zm)
    return {
      message: `UTM zone "${clip(z)}" is not a zone number 1–60 (optionally with its band letter)`,
    };
  const zone = Number(zm[1]);
  if (zone < 1 || zone > 60) return { message: `UTM zone ${zone} out of range 1…60` };
  const h = hemi.trim().toUpperCase();
  if (h !== '') {
    const hemisphere =
      h === 'N' || h === 'NORTH' ? 'N' : h === 'S' || h === 'SOUTH' ? 'S' : undefined;
    if (!hemisphere) return { message: `hemisphere "${clip(hemi)}" is not N or S` };
    if (easting < 100000 || easting > 900000)
      return { message: `UTM easting ${easting} out of range 100000…900000` };
    if (northing < 0 || northing > 10000000)
      return { message: `UTM northing ${northing} out of range 0…10000000` };
    const p = fromUTM({ zone, hemisphere, easting, northing });
    const err = checkLatLon(p.lat, p.lon);
    return err ? { message: err } : p;
  }
  const letter = (band.trim() || zm[2] || '').toUpperCase();
  if (!letter)
    return {
      message: `UTM zone "${clip(z)}" needs a latitude band letter (e.g. 32T) or a hemisphere column`,
    };
  const r = parseCoordinate(`${zone}${letter} ${easting} ${northing}`);
  return r.ok ? { lat: r.lat, lon: r.lon } : { message: r.message.split(';')[0] };
}
