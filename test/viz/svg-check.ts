/** A small well-formedness check for the SVG strings (tags balanced, entities escaped). */
export function checkWellFormedSvg(svg: string): void {
  if (!svg.startsWith('<svg ')) throw new Error('does not start with <svg');
  const stack: string[] = [];
  const re = /<(\/?)([a-zA-Z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>/g;
  let last = 0;
  let m: RegExpExecArray | null;
  while ((m = re.exec(svg)) !== null) {
    const between = svg.slice(last, m.index);
    if (between.includes('<') || between.includes('>')) throw new Error(`stray angle bracket near ${JSON.stringify(between.slice(0, 40))}`);
    if (/&(?!amp;|lt;|gt;|quot;|apos;)/.test(between)) throw new Error('unescaped &');
    last = re.lastIndex;
    const [, close, name, , selfClose] = m;
    if (close) {
      if (stack.pop() !== name) throw new Error(`unbalanced </${name}>`);
    } else if (!selfClose) stack.push(name!);
  }
  if (svg.slice(last).trim() !== '') throw new Error('text after the root element');
  if (stack.length !== 0) throw new Error(`unclosed <${stack.join('>, <')}>`);
}
