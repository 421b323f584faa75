/**
 * The data licences an export may carry, by SPDX id (spdx.org/licenses): the open licences data
 * repositories commonly accept for ecological data (common practice; the list is short on purpose).
 * Titles and URLs are those of the SPDX list and the licence stewards (from memory).
 */
export interface DataLicence {
  id: string;
  title: string;
  url: string;
}

export const DATA_LICENCES: readonly DataLicence[] = [
  { id: 'CC0-1.0', title: 'Creative Commons Zero v1.0 Universal', url: 'https://creativecommons.org/publicdomain/zero/1.0/' },
  { id: 'CC-BY-4.0', title: 'Creative Commons Attribution 4.0 International', url: 'https://creativecommons.org/licenses/by/4.0/' },
  {
    id: 'CC-BY-SA-4.0',
    title: 'Creative Commons Attribution Share Alike 4.0 International',
    url: 'https://creativecommons.org/licenses/by-sa/4.0/',
  },
  {
    id: 'CC-BY-NC-4.0',
    title: 'Creative Commons Attribution Non Commercial 4.0 International',
    url: 'https://creativecommons.org/licenses/by-nc/4.0/',
  },
  { id: 'ODC-By-1.0', title: 'Open Data Commons Attribution License v1.0', url: 'https://opendatacommons.org/licenses/by/1-0/' },
  { id: 'ODbL-1.0', title: 'Open Data Commons Open Database License v1.0', url: 'https://opendatacommons.org/licenses/odbl/1-0/' },
  {
    id: 'PDDL-1.0',
    title: 'Open Data Commons Public Domain Dedication & License 1.0',
    url: 'https://opendatacommons.org/licenses/pddl/1-0/',
  },
];

export const DATA_LICENCE_IDS = DATA_LICENCES.map((l) => l.id) as [string, ...string[]];

export const dataLicence = (id: string): DataLicence | undefined => DATA_LICENCES.find((l) => l.id === id);
