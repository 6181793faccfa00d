/**
 * The text of each page of a PDF that Chromium printed, enough for a test to
 * read what is on a page: page objects in order, their fonts' ToUnicode maps,
 * and the hex glyph strings their content streams show. Not a general PDF
 * reader (no encryption, no object streams, which Chromium's PDFs do not use).
 */
import { inflateSync } from "node:zlib";

type PdfObject = { dict: string; stream: Buffer | null };

function readObjects(pdf: Buffer): Map<number, PdfObject> {
  const text = pdf.toString("latin1");
  const objects = new Map<number, PdfObject>();
  const pattern = /(\d+) 0 obj\s*([\s\S]*?)endobj/g;
  for (let match = pattern.exec(text); match; match = pattern.exec(text)) {
    const body = match[2]!;
    const streamAt = body.indexOf("stream");
    if (streamAt === -1) {
      objects.set(Number(match[1]), { dict: body, stream: null });
      continue;
    }
    const dict = body.slice(0, streamAt);
    let start = streamAt + "stream".length;
    if (body[start] === "\r") start++;
    if (body[start] === "\n") start++;
    const end = body.lastIndexOf("endstream");
    let raw = Buffer.from(body.slice(start, end), "latin1");
    if (/\/FlateDecode/.test(dict)) raw = inflateSync(raw.subarray(0, Number(/\/Length (\d+)/.exec(dict)?.[1] ?? raw.length)));
    objects.set(Number(match[1]), { dict, stream: raw });
  }
  return objects;
}

const refsIn = (text: string) => [...text.matchAll(/(\d+) 0 R/g)].map((m) => Number(m[1]));

/** A font's glyph code → text map from its ToUnicode CMap (bfchar and bfrange). */
function toUnicode(cmap: string): Map<string, string> {
  const map = new Map<string, string>();
  const hexText = (hex: string) => String.fromCodePoint(...(hex.match(/.{4}/g) ?? []).map((h) => parseInt(h, 16)));
  for (const block of cmap.matchAll(/beginbfchar([\s\S]*?)endbfchar/g)) {
    for (const pair of block[1]!.matchAll(/<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>/g)) map.set(pair[1]!.toUpperCase(), hexText(pair[2]!));
  }
  for (const block of cmap.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
    for (const range of block[1]!.matchAll(/<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>\s*(<[0-9A-Fa-f]+>|\[[^\]]*\])/g)) {
      const from = parseInt(range[1]!, 16);
      const to = parseInt(range[2]!, 16);
      const width = range[1]!.length;
      const targets = range[3]!.startsWith("[") ? [...range[3]!.matchAll(/<([0-9A-Fa-f]+)>/g)].map((m) => m[1]!) : null;
      const base = targets ? 0 : parseInt(range[3]!.slice(1, -1), 16);
      for (let code = from; code <= to; code++) {
        const key = code.toString(16).toUpperCase().padStart(width, "0");
        map.set(key, targets ? hexText(targets[code - from]!) : String.fromCodePoint(base + code - from));
      }
    }
  }
  return map;
}

/** The text shown on each page, in page order; text objects are separated by spaces. */
export function pdfPageTexts(pdf: Buffer): string[] {
  const objects = readObjects(pdf);
  const dictOf = (n: number) => objects.get(n)?.dict ?? "";
  const root = [...objects.values()].find((o) => /\/Type\s*\/Catalog/.test(o.dict))!;
  const pagesOf = (n: number): number[] => {
    const dict = dictOf(n);
    if (/\/Type\s*\/Pages/.test(dict)) return refsIn(/\/Kids\s*\[([^\]]*)\]/.exec(dict)![1]!).flatMap(pagesOf);
    return [n];
  };
  const pages = pagesOf(Number(/\/Pages (\d+) 0 R/.exec(root.dict)![1]));
  const cmaps = new Map<number, Map<string, string>>();
  const cmapOfFont = (fontRef: number) => {
    if (!cmaps.has(fontRef)) {
      const toUnicodeRef = /\/ToUnicode (\d+) 0 R/.exec(dictOf(fontRef))?.[1];
      cmaps.set(fontRef, toUnicodeRef ? toUnicode(objects.get(Number(toUnicodeRef))!.stream!.toString("latin1")) : new Map());
    }
    return cmaps.get(fontRef)!;
  };
  return pages.map((page) => {
    const dict = dictOf(page);
    const resourcesRef = /\/Resources (\d+) 0 R/.exec(dict)?.[1];
    const resources = resourcesRef ? dictOf(Number(resourcesRef)) : dict;
    const fontBlock = /\/Font\s*(<<[\s\S]*?>>|\d+ 0 R)/.exec(resources)?.[1] ?? "";
    const fontDict = fontBlock.startsWith("<<") ? fontBlock : dictOf(refsIn(fontBlock)[0]!);
    const fonts = new Map([...fontDict.matchAll(/\/([\w.+-]+)\s+(\d+) 0 R/g)].map((m) => [m[1]!, Number(m[2])]));
    const contents = /\/Contents\s*(\[[^\]]*\]|\d+ 0 R)/.exec(dict)?.[1] ?? "";
    const stream = refsIn(contents)
      .map((n) => objects.get(n)?.stream?.toString("latin1") ?? "")
      .join("\n");
    let font: Map<string, string> = new Map();
    let out = "";
    for (const token of stream.matchAll(/\/([\w.+-]+)\s+[\d.]+\s+Tf|<([0-9A-Fa-f]*)>|\bET\b/g)) {
      if (token[1] !== undefined) font = fonts.has(token[1]) ? cmapOfFont(fonts.get(token[1])!) : new Map();
      else if (token[2] !== undefined) out += (token[2].toUpperCase().match(/.{4}/g) ?? []).map((code) => font.get(code) ?? "").join("");
      else out += " ";
    }
    return out.replace(/\s+/g, " ").trim();
  });
}
