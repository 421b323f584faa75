/**
 * Ecological Metadata Language 2.2.0 (eml.ecoinformatics.org, KNB / NCEAS) for an export: the
 * dataset with title, creator, contact, coverage, methods, and one dataTable per CSV whose
 * attributes come from the same definitions as the CSV headers. Units are declared as custom
 * units in an STMML unit list (the way EML 2.2 defines units outside its dictionary).
 */
import { localDay } from '../../shared/time/site-time';
import { tablesForSite, tablePath, UNITS, type FieldDef } from './export-schema';
import type { Provenance } from './data-package';

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** A unit of EML's standard unit dictionary (eml-unitDictionary.xml), by its name there. */
interface StandardUnit {
  standard: string;
}
/** A unit the dictionary lacks, defined completely (STMML: unitType, parentSI, multiplierToSI) so a program can convert it. */
export interface CustomUnit {
  custom: string;
  unitType: string;
  parentSI: string;
  multiplierToSI: string;
  abbreviation: string;
  description: string;
}

/** Every unit of export-schema.ts in EML terms: the dictionary's names where they exist. */
export const EML_UNITS: Record<string, StandardUnit | CustomUnit> = {
  [UNITS.flux]: { standard: 'micromolePerMeterSquaredPerSecond' },
  [UNITS.total]: {
    custom: 'gramCarbonPerMeterSquared',
    unitType: 'arealMassDensity',
    parentSI: 'kilogramPerMeterSquared',
    multiplierToSI: '0.001',
    abbreviation: 'g C/m²',
    description: 'grams of carbon (as CO2-C, 12.011 g per mol) per square metre',
  },
  [UNITS.cm]: { standard: 'centimeter' },
  [UNITS.cm2]: { standard: 'centimeterSquared' },
  [UNITS.cm3]: { standard: 'centimeterCubed' },
  [UNITS.s]: { standard: 'second' },
  [UNITS.degC]: { standard: 'celsius' },
  [UNITS.percent]: { standard: 'percent' },
  [UNITS.ppm]: { standard: 'micromolePerMole' },
  [UNITS.mmolMol]: { standard: 'millimolePerMole' },
  [UNITS.kPa]: { standard: 'kilopascal' },
  [UNITS.degree]: { standard: 'degree' },
  // µmol mol-1 is dimensionless (1e-6), so µmol mol-1 s-1 is 1e-6 per second: a frequency in SI terms.
  [UNITS.ppmPerS]: {
    custom: 'micromolePerMolePerSecond',
    unitType: 'frequency',
    parentSI: 'hertz',
    multiplierToSI: '0.000001',
    abbreviation: 'µmol/mol/s',
    description: 'micromoles per mole per second (rate of change of a mole fraction)',
  },
  [UNITS.kelvin]: { standard: 'kelvin' },
  [UNITS.day]: { standard: 'nominalDay' },
  [UNITS.none]: { standard: 'dimensionless' },
};

function unitXml(unit: string | undefined): string {
  const u = EML_UNITS[unit ?? UNITS.none];
  if (!u) throw new Error(`No EML unit for ${unit}`);
  return 'standard' in u ? `<standardUnit>${u.standard}</standardUnit>` : `<customUnit>${u.custom}</customUnit>`;
}

function scale(f: FieldDef): string {
  if (f.type === 'date') return '<dateTime><formatString>YYYY-MM-DD</formatString></dateTime>';
  // Local twins carry the offset of their moment in the site's zone (named in the attribute definition).
  if (f.type === 'datetime' && f.localOf) return '<dateTime><formatString>YYYY-MM-DDThh:mm:ss+hh:mm</formatString></dateTime>';
  if (f.type === 'datetime') return '<dateTime><formatString>YYYY-MM-DDThh:mm:ss.sssZ</formatString></dateTime>';
  if (f.type === 'string' || f.type === 'boolean') {
    const def = f.type === 'boolean' ? `${f.description} (true or false)` : f.description;
    // A closed list of codes is an enumerated domain; the field's description says what each code means.
    const domain = f.enum
      ? `<enumeratedDomain>${f.enum.map((c) => `<codeDefinition><code>${esc(c)}</code><definition>${esc(`${c}: ${f.description}`)}</definition></codeDefinition>`).join('')}</enumeratedDomain>`
      : `<textDomain><definition>${esc(def)}</definition></textDomain>`;
    return `<nominal><nonNumericDomain>${domain}</nonNumericDomain></nominal>`;
  }
  const numberType = f.type === 'integer' ? 'whole' : 'real';
  // Celsius has an arbitrary zero: an interval scale; everything else here is a ratio scale.
  const kind = f.unit === UNITS.degC ? 'interval' : 'ratio';
  const bounds =
    f.minimum !== undefined || f.maximum !== undefined
      ? `<bounds>${f.minimum !== undefined ? `<minimum exclusive="false">${f.minimum}</minimum>` : ''}${f.maximum !== undefined ? `<maximum exclusive="false">${f.maximum}</maximum>` : ''}</bounds>`
      : '';
  return `<${kind}><unit>${unitXml(f.unit)}</unit><numericDomain><numberType>${numberType}</numberType>${bounds}</numericDomain></${kind}>`;
}

function attribute(f: FieldDef): string {
  return (
    `<attribute><attributeName>${esc(f.name)}</attributeName><attributeDefinition>${esc(f.description)}</attributeDefinition>` +
    `<measurementScale>${scale(f)}</measurementScale>` +
    '</attribute>'
  );
}

export interface EmlCoverage {
  west: number;
  east: number;
  north: number;
  south: number;
  fromDay: string;
  toDay: string;
}

const dateRange = (fromDay: string, toDay: string) =>
  `<temporalCoverage><rangeOfDates><beginDate><calendarDate>${fromDay}</calendarDate></beginDate>` +
  `<endDate><calendarDate>${toDay}</calendarDate></endDate></rangeOfDates></temporalCoverage>`;

/**
 * `cov` is the dataset's coverage (the span of the data); `tableWindows` gives a table its own
 * period where it covers less (the seasonal totals' window).
 */
export function emlDocument(
  p: Provenance,
  cov: EmlCoverage | null,
  rowCounts: Record<string, number>,
  bytes: Record<string, number>,
  methods: string[],
  tableWindows: Record<string, { fromDay: string; toDay: string }> = {},
): string {
  const [given, ...rest] = p.generatedBy.name.split(' ');
  const person =
    `<individualName>${rest.length ? `<givenName>${esc(given)}</givenName><surName>${esc(rest.join(' '))}</surName>` : `<surName>${esc(given)}</surName>`}</individualName>` +
    `<electronicMailAddress>${esc(p.generatedBy.email)}</electronicMailAddress>`;
  const coverage = cov
    ? `<coverage><geographicCoverage><geographicDescription>${esc(p.site.name)}</geographicDescription><boundingCoordinates>` +
      `<westBoundingCoordinate>${cov.west}</westBoundingCoordinate><eastBoundingCoordinate>${cov.east}</eastBoundingCoordinate>` +
      `<northBoundingCoordinate>${cov.north}</northBoundingCoordinate><southBoundingCoordinate>${cov.south}</southBoundingCoordinate>` +
      `</boundingCoordinates></geographicCoverage>${dateRange(cov.fromDay, cov.toDay)}</coverage>`
    : '';
  const tables = tablesForSite(p.site)
    .map(
      (t) =>
        `<dataTable id="${t.name}"><entityName>${esc(tablePath(t.name))}</entityName>` +
        `<entityDescription>${esc(t.description)}</entityDescription><physical><objectName>${esc(tablePath(t.name))}</objectName>` +
        `<size unit="byte">${bytes[t.name] ?? 0}</size><characterEncoding>UTF-8</characterEncoding><dataFormat><textFormat><numHeaderLines>1</numHeaderLines>` +
        '<recordDelimiter>\\n</recordDelimiter><attributeOrientation>column</attributeOrientation><simpleDelimited><fieldDelimiter>,</fieldDelimiter>' +
        '<quoteCharacter>"</quoteCharacter></simpleDelimited></textFormat></dataFormat></physical>' +
        (tableWindows[t.name] ? `<coverage>${dateRange(tableWindows[t.name].fromDay, tableWindows[t.name].toDay)}</coverage>` : '') +
        `<attributeList>${t.fields.map(attribute).join('')}</attributeList><numberOfRecords>${rowCounts[t.name] ?? 0}</numberOfRecords></dataTable>`,
    )
    .join('\n    ');
  const units = Object.values(EML_UNITS)
    .filter((u): u is CustomUnit => 'custom' in u)
    .map(
      (u) =>
        `<stmml:unit id="${u.custom}" name="${u.custom}" ` +
        `unitType="${u.unitType}" parentSI="${u.parentSI}" multiplierToSI="${u.multiplierToSI}" abbreviation="${esc(u.abbreviation)}">` +
        `<stmml:description>${esc(u.description)}</stmml:description></stmml:unit>`,
    )
    .join('');
  return (
    `<?xml version="1.0" encoding="UTF-8"?>
<eml:eml xmlns:eml="https://eml.ecoinformatics.org/eml-2.2.0" xmlns:stmml="http://www.xml-cml.org/schema/stmml-1.2"
  xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance"
  xsi:schemaLocation="https://eml.ecoinformatics.org/eml-2.2.0 https://eml.ecoinformatics.org/eml-2.2.0/eml.xsd"
  packageId="fluxwalk-${p.jobId}" system="fluxwalk">
  <dataset>
    <title>Soil CO2 efflux by closed chambers on permanent collars, ${esc(p.site.name)}</title>
    <creator>${person}</creator>
    <pubDate>${localDay(p.generatedAt, p.site.timezone)}</pubDate>
    <language>en</language>
    <abstract><para>Soil CO2 efflux from closed-chamber closures on permanent collars, with raw series, review decisions, QC flags, visit conditions, ` +
    `offsets and probe readings; fluxes aggregated along the experimental design, temperature responses (Q10; Lloyd and Taylor 1994) ` +
    `and seasonal totals over a stated period with Student t intervals over plots. Generated by the flux engine ${esc(p.engineVersion)}.</para></abstract>
    <keywordSet><keyword>soil respiration</keyword><keyword>CO2 efflux</keyword><keyword>closed chamber</keyword><keyword>temperature response</keyword></keywordSet>
    <intellectualRights><para>${esc(`This dataset is licensed under ${p.license.title} (SPDX ${p.license.id}, ${p.license.url}).`)}</para></intellectualRights>
    <licensed><licenseName>${esc(p.license.title)}</licenseName><url>${esc(p.license.url)}</url><identifier>${esc(p.license.id)}</identifier></licensed>
    ${coverage}
    <contact>${person}</contact>
    <methods>${methods.map((m) => `<methodStep><description><para>${esc(m)}</para></description></methodStep>`).join('')}</methods>
    ${tables}
  </dataset>
  <additionalMetadata><metadata><stmml:unitList>${units}</stmml:unitList></metadata></additionalMetadata>
</eml:eml>
`
  );
}
