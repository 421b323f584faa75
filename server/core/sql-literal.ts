/**
 * Text as a dollar-quoted SQL string constant (`$fw$…$fw$`): nothing inside needs escaping, so a
 * large value goes into a statement's text as it is, whatever it holds and whatever the server's
 * `standard_conforming_strings`. The tag is one the text cannot end early: its first appearance in
 * the text followed by the closing tag is the closing tag itself.
 */
export function dollarQuoted(text: string): string {
  let tag = '$fw$';
  for (let n = 0; (text + tag).indexOf(tag) !== text.length; n++) tag = `$fw${n}$`;
  return tag + text + tag;
}
