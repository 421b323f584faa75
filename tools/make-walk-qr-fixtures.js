#!/usr/bin/env node
// Writes the QR images the Walk component tests decode: a collar tag exactly as the tag sheet
// encodes it (shared/model/collar-tag.ts), a blank tag for a new collar with its planned code,
// and a QR code that is not a collar tag.
// Run: node tools/make-walk-qr-fixtures.js  (re-run only if the tag address format changes).
const path = require('node:path');
const QRCode = require('qrcode');

const OUT = path.resolve(__dirname, '../test/fixtures/walk');
// An invented collar id and origin, as a printed tag sheet would hold them.
const COLLAR_ID = '3b9d6c1e-2f4a-4e8b-9c7d-5a1b2c3d4e5f';
const TAG = `https://alder-hollow.fluxwalk.example/walk/collars/${COLLAR_ID}`;
// A blank tag printed for a collar not installed yet, with the planned code N-07.
const BLANK_ID = '9e8d7c6b-5a49-4382-a716-0f1e2d3c4b5a';
const BLANK_TAG = `https://alder-hollow.fluxwalk.example/walk/collars/${BLANK_ID}?code=N-07`;

async function main() {
  const opts = { errorCorrectionLevel: 'M', margin: 4, scale: 6, color: { dark: '#000000', light: '#ffffff' } };
  await QRCode.toFile(path.join(OUT, 'collar-tag-qr.png'), TAG, opts);
  await QRCode.toFile(path.join(OUT, 'blank-tag-qr.png'), BLANK_TAG, opts);
  await QRCode.toFile(path.join(OUT, 'not-a-tag-qr.png'), 'https://example.org/some/other/thing', opts);
  console.log(
    `wrote collar-tag-qr.png (${TAG}), blank-tag-qr.png (${BLANK_TAG}) and not-a-tag-qr.png to ${path.relative(process.cwd(), OUT)}`,
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
