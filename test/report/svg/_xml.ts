/**
 * A small strict XML well-formedness checker for the SVG tests (Deno has no
 * DOMParser). Checks, after W3C XML 1.0 (5th ed.) §2: an optional XML
 * declaration first; exactly one root element; every start tag closed by a
 * matching end tag in order; attribute values quoted, names unique per
 * element; `<` never in text or attribute values; `&` only as one of the five
 * predefined entities or a character reference. Comments and CDATA are not
 * accepted (our writer never emits them). Throws SyntaxError with the offset.
 */
export interface XmlElement {
  readonly name: string;
  readonly attrs: Record<string, string>;
  readonly children: XmlElement[];
  /** Character data directly inside, entities decoded. */
  text: string;
}

const NAME = /^[A-Za-z_:][A-Za-z0-9_.:-]*/;

export function parseXml(src: string): XmlElement {
  let i = 0;
  const fail = (what: string): never => {
    throw new SyntaxError(
      `Cannot parse XML as ${what}: offset=${i}, near=${JSON.stringify(src.slice(i, i + 30))}`,
    );
  };
  const decode = (s: string): string => {
    if (s.includes("<")) fail("'<' appears in character data");
    return s.replace(/&([^;]*);?/g, (m, body: string) => {
      if (!m.endsWith(";")) fail("an '&' is not an entity reference");
      const named: Record<string, string> = { amp: "&", lt: "<", gt: ">", quot: '"', apos: "'" };
      if (body in named) return named[body]!;
      if (/^#[0-9]+$/.test(body)) return String.fromCodePoint(Number(body.slice(1)));
      if (/^#x[0-9A-Fa-f]+$/.test(body)) return String.fromCodePoint(parseInt(body.slice(2), 16));
      return fail(`unknown entity &${body};`);
    });
  };
  const ws = () => {
    while (i < src.length && /\s/.test(src[i]!)) i++;
  };
  if (src.startsWith("<?xml")) {
    const end = src.indexOf("?>");
    if (end < 0) fail("the XML declaration is not closed");
    i = end + 2;
  }
  ws();
  const stack: XmlElement[] = [];
  let root: XmlElement | undefined;
  while (i < src.length) {
    if (src[i] === "<") {
      if (src.startsWith("<!--", i) || src.startsWith("<![CDATA[", i) || src.startsWith("<?", i)) {
        fail("comments, CDATA and processing instructions are not expected");
      }
      if (src[i + 1] === "/") {
        i += 2;
        const m = NAME.exec(src.slice(i));
        if (!m) fail("an end tag has no name");
        const name = m![0];
        i += name.length;
        ws();
        if (src[i] !== ">") fail("an end tag is not closed");
        i++;
        const open = stack.pop();
        if (!open || open.name !== name) fail(`end tag </${name}> does not match <${open?.name}>`);
        if (stack.length === 0) {
          ws();
          if (i < src.length) fail("content follows the root element");
        }
        continue;
      }
      i++;
      const m = NAME.exec(src.slice(i));
      if (!m) fail("a start tag has no name");
      const name = m![0];
      i += name.length;
      const attrs: Record<string, string> = {};
      while (true) {
        const before = i;
        ws();
        if (src[i] === "/" && src[i + 1] === ">") {
          i += 2;
          const el: XmlElement = { name, attrs, children: [], text: "" };
          if (stack.length === 0) {
            if (root) fail("a second root element");
            root = el;
            ws();
            if (i < src.length) fail("content follows the root element");
          } else stack[stack.length - 1]!.children.push(el);
          break;
        }
        if (src[i] === ">") {
          i++;
          const el: XmlElement = { name, attrs, children: [], text: "" };
          if (stack.length === 0) {
            if (root) fail("a second root element");
            root = el;
          } else stack[stack.length - 1]!.children.push(el);
          stack.push(el);
          break;
        }
        if (i === before) fail("attributes are not separated by white space");
        const an = NAME.exec(src.slice(i));
        if (!an) fail("an attribute has no name");
        const aname = an![0];
        i += aname.length;
        ws();
        if (src[i] !== "=") fail(`attribute ${aname} has no '='`);
        i++;
        ws();
        const q = src[i];
        if (q !== '"' && q !== "'") fail(`attribute ${aname} is not quoted`);
        const end = src.indexOf(q!, i + 1);
        if (end < 0) fail(`attribute ${aname} is not closed`);
        if (aname in attrs) fail(`attribute ${aname} is repeated`);
        attrs[aname] = decode(src.slice(i + 1, end));
        i = end + 1;
      }
      continue;
    }
    const next = src.indexOf("<", i);
    const end = next < 0 ? src.length : next;
    const chunk = src.slice(i, end);
    if (stack.length === 0) {
      if (chunk.trim() !== "") fail("text outside the root element");
    } else stack[stack.length - 1]!.text += decode(chunk);
    i = end;
  }
  if (stack.length > 0) fail(`<${stack[stack.length - 1]!.name}> is not closed`);
  if (!root) fail("there is no root element");
  return root!;
}

/** All elements below (and including) `el`, depth first. */
export function allElements(el: XmlElement): XmlElement[] {
  return [el, ...el.children.flatMap(allElements)];
}

/** The text of an element including its descendants' text. */
export function fullText(el: XmlElement): string {
  return el.text + el.children.map(fullText).join("");
}

/** Texts of all <text> elements. */
export function texts(root: XmlElement): string[] {
  return allElements(root).filter((e) => e.name === "text").map(fullText);
}

/** Elements with a given class attribute. */
export function byClass(root: XmlElement, cls: string): XmlElement[] {
  return allElements(root).filter((e) => (e.attrs.class ?? "").split(" ").includes(cls));
}
