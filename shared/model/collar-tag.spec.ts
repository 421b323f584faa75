import { collarIdFromTag, collarTagUrl, plannedTagCodes, readCollarTag } from './collar-tag';

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

  it('when a blank tag carries a planned code, then the code comes back with the id, decoded', () => {
    const url = collarTagUrl('https://fw.example', ID, 'N-7 & B');
    expect(url).toBe(`https://fw.example/walk/collars/${ID}?code=N-7%20%26%20B`);
    expect(readCollarTag(url)).toEqual({ id: ID, code: 'N-7 & B' });
    expect(readCollarTag(collarTagUrl('https://fw.example', ID))).toEqual({ id: ID, code: null });
  });

  it('when the planned code is empty or longer than a code can be, then it is ignored and the id still reads', () => {
    expect(readCollarTag(`https://fw.example/walk/collars/${ID}?code=%20`)).toEqual({ id: ID, code: null });
    expect(readCollarTag(`https://fw.example/walk/collars/${ID}?code=${'x'.repeat(41)}`)).toEqual({ id: ID, code: null });
  });

  it('when planned codes are asked for, then they run on from the first number, padded to the digits', () => {
    expect(plannedTagCodes('N-', 8, 2, 3)).toEqual(['N-08', 'N-09', 'N-10']);
    expect(plannedTagCodes('C', 99, 1, 2)).toEqual(['C99', 'C100']);
  });
});
