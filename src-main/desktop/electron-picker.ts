import type { FilePurpose, SavePurpose } from '../../shared-core/api.js';

/** Dialog filters by purpose (plain data, so the choice of extensions is tested without Electron). */
export const openFilters: Record<FilePurpose, { name: string; extensions: string[] }[]> = {
  study: [{ name: 'Limit Ledger study', extensions: ['ledger'] }],
  data: [{ name: 'Counts (CSV, text, Excel workbook)', extensions: ['csv', 'txt', 'tsv', 'xlsx'] }],
  key: [{ name: 'Signing key (PKCS#12 or encrypted PKCS#8)', extensions: ['p12', 'pfx', 'pem', 'key'] }],
  certificate: [{ name: 'Certificate', extensions: ['pem', 'crt', 'cer'] }],
};

export const saveFilters: Record<SavePurpose, { name: string; extensions: string[] }[]> = {
  study: [{ name: 'Limit Ledger study', extensions: ['ledger'] }],
  packet: [{ name: 'PDF packet', extensions: ['pdf'] }],
  workbook: [{ name: 'Excel workbook', extensions: ['xlsx'] }],
  certificate: [{ name: 'Certificate', extensions: ['pem', 'p12'] }],
};
