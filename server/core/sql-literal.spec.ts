import { dollarQuoted } from './sql-literal';

/** Where a dollar-quoted constant ends, read as PostgreSQL's lexer does (the first closing tag after the opening one). */
function bodyOf(literal: string): string {
  const tag = /^\$[A-Za-z_][A-Za-z0-9_]*\$|^\$\$/.exec(literal)![0];
  const end = literal.indexOf(tag, tag.length);
  expect(end).toBe(literal.length - tag.length);
  return literal.slice(tag.length, end);
}

describe('dollarQuoted', () => {
  it.each([
    ['plain text', '{"a":1}'],
    ['quotes and backslashes', `it's a \\ "quoted" \\' thing`],
    ['the default tag inside', 'before $fw$ after'],
    ['a tag cut by the closing one', 'ends in $fw'],
    ['a lone dollar at the end', 'costs 5 $'],
    ['every tag tried so far', '$fw$ $fw0$ $fw1$ $fw'],
    ['nothing', ''],
    ['letters from other scripts', 'Ünïcødé 土壌 🌱'],
  ])('when the text holds %s, then the constant ends exactly after it', (_what, text) => {
    expect(bodyOf(dollarQuoted(text))).toBe(text);
  });
});
