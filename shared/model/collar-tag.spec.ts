import { collarIdFromTag, collarTagUrl } from './collar-tag';

const ID = '6f1c2a4e-8b7d-4c3e-9a1f-2b3c4d5e6f70';

describe('collar tag addresses', () => {
  it('when a tag address is built and read back, then the collar id comes out', () => {
    expect(collarTagUrl('https://fw.example/', ID)).toBe(`https://fw.example/walk/collars/${ID}`);
    expect(collarIdFromTag(collarTagUrl('https://fw.example', ID))).toBe(ID);
  });

  it('when a tag was printed on another origin or holds a bare id, then the id is still taken from the end', () => {
    expect(collarIdFromTag(`http://10.0.0.7:8080/walk/collars/${ID.toUpperCase()}`)).toBe(ID);
    expect(collarIdFromTag(` ${ID} `)).toBe(ID);
  });

  it('when the text holds no collar id, then nothing opens', () => {
    expect(collarIdFromTag('https://fw.example/walk/collars/not-an-id')).toBeNull();
    expect(collarIdFromTag('hello')).toBeNull();
  });
});
