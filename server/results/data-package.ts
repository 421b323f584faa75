/**
 * datapackage.json after the Frictionless Data Package and Table Schema specifications
 * (frictionlessdata.io, v1): one tabular resource per CSV with its field types, units (a custom
 * `unit` property beside the standard ones), primary and foreign keys; provenance as a custom
 * property and as its own JSON file.
 */
import type { DataLicence } from '../../shared/results/data-licences';
import { localDay } from '../../shared/time/site-time';
import { tablesForSite, tablePath, type FieldDef, type FieldType } from './export-schema';

export interface Provenance {
  engineVersion: string;
  generatedAt: string;
  generatedBy: { id: string; name: string; email: string };
  jobId: string;
  site: { id: string; name: string; timezone: string; tempDepthCm: number; tempDepthToleranceCm: number };
  license: DataLicence;
  parameters: Record<string, unknown>;
  counts: Record<string, number>;
}

const FORMAT: Partial<Record<FieldType, string>> = { date: 'default', datetime: 'default' };

function constraints(f: FieldDef) {
  const c = {
    ...(f.required ? { required: true } : {}),
    ...(f.enum ? { enum: [...f.enum] } : {}),
    ...(f.minimum !== undefined ? { minimum: f.minimum } : {}),
    ...(f.maximum !== undefined ? { maximum: f.maximum } : {}),
  };
  return Object.keys(c).length ? { constraints: c } : {};
}

export function dataPackage(p: Provenance, rowCounts: Record<string, number>, bytes: Record<string, number>) {
  return {
    profile: 'data-package',
    name: `fluxwalk-${p.site.name
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-|-$/g, '')}-${localDay(p.generatedAt, p.site.timezone)}`,
    id: p.jobId,
    title: `Soil CO2 efflux, ${p.site.name}`,
    description:
      'Chamber closures, their raw series, visits, collars, probe readings, and fluxes aggregated along the experimental design ' +
      '(closure → visit → collar → plot → treatment), temperature responses and seasonal totals.',
    version: '1.0.0',
    created: p.generatedAt,
    licenses: [{ name: p.license.id, path: p.license.url, title: p.license.title }],
    contributors: [{ title: p.generatedBy.name, email: p.generatedBy.email, role: 'author' }],
    'fluxwalk:provenance': p,
    resources: [
      ...tablesForSite(p.site).map((t) => ({
        name: t.name,
        path: tablePath(t.name),
        profile: 'tabular-data-resource',
        title: t.title,
        description: t.description,
        format: 'csv',
        mediatype: 'text/csv',
        encoding: 'utf-8',
        bytes: bytes[t.name],
        'fluxwalk:rows': rowCounts[t.name],
        dialect: { delimiter: ',', doubleQuote: true, header: true, lineTerminator: '\n' },
        schema: {
          fields: t.fields.map((f) => ({
            name: f.name,
            type: f.type,
            ...(FORMAT[f.type] ? { format: FORMAT[f.type] } : {}),
            description: f.description,
            ...(f.unit ? { unit: f.unit } : {}),
            ...constraints(f),
          })),
          missingValues: [''],
          ...(t.primaryKey ? { primaryKey: t.primaryKey } : {}),
          ...(t.foreignKeys ? { foreignKeys: t.foreignKeys } : {}),
        },
      })),
      {
        name: 'provenance',
        path: 'provenance.json',
        profile: 'data-resource',
        format: 'json',
        mediatype: 'application/json',
        description: 'Engine version, parameters, who generated the export and when.',
      },
      {
        name: 'metadata-eml',
        path: 'metadata.eml.xml',
        profile: 'data-resource',
        format: 'xml',
        mediatype: 'application/xml',
        description: 'Ecological Metadata Language 2.2 description of the dataset.',
      },
    ],
  };
}
