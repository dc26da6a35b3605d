// A one-page PDF holding one JPEG image, for the saved agreement report. The smallest
// file the PDF 1.4 reference (Adobe 2001, §3.4 file structure, §4.8 images with the
// DCTDecode filter) allows: catalog, page tree, page, image XObject, content stream,
// and a cross-reference table with exact byte offsets. Written by hand because this is
// all the report needs; the image is drawn by the renderer.

const A4_WIDTH_PT = 595.28;

function ascii(text: string): Uint8Array {
  return new TextEncoder().encode(text);
}

/** Reads a JPEG's pixel size from its start-of-frame marker. */
export function jpegSize(jpeg: Uint8Array): { width: number; height: number } {
  if (jpeg[0] !== 0xff || jpeg[1] !== 0xd8) throw new Error('the report image is not a JPEG');
  let i = 2;
  while (i + 9 < jpeg.length) {
    if (jpeg[i] !== 0xff) throw new Error('the report image has a damaged JPEG header');
    const marker = jpeg[i + 1];
    const length = (jpeg[i + 2] << 8) | jpeg[i + 3];
    // SOF0..SOF15 except DHT (C4), JPG (C8) and DAC (CC) carry the frame size.
    if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
      return { height: (jpeg[i + 5] << 8) | jpeg[i + 6], width: (jpeg[i + 7] << 8) | jpeg[i + 8] };
    }
    i += 2 + length;
  }
  throw new Error('the report image has no JPEG frame size');
}

/** The PDF bytes: the page is A4 wide and as tall as the image at that width. */
export function imagePdf(jpeg: Uint8Array): Uint8Array {
  const { width, height } = jpegSize(jpeg);
  const pageW = A4_WIDTH_PT;
  const pageH = Math.round((pageW * height) / width * 100) / 100;
  const content = `q ${pageW} 0 0 ${pageH} 0 0 cm /Im0 Do Q\n`;
  const parts: Uint8Array[] = [];
  const offsets: number[] = [];
  let length = 0;
  const put = (bytes: Uint8Array) => {
    parts.push(bytes);
    length += bytes.length;
  };
  const object = (n: number, head: string, stream?: Uint8Array) => {
    offsets[n] = length;
    if (!stream) return put(ascii(`${n} 0 obj\n${head}\nendobj\n`));
    put(ascii(`${n} 0 obj\n${head}\nstream\n`));
    put(stream);
    put(ascii('\nendstream\nendobj\n'));
  };
  put(ascii('%PDF-1.4\n%\xe2\xe3\xcf\xd3\n'));
  object(1, '<< /Type /Catalog /Pages 2 0 R >>');
  object(2, '<< /Type /Pages /Kids [3 0 R] /Count 1 >>');
  object(3, `<< /Type /Page /Parent 2 0 R /MediaBox [0 0 ${pageW} ${pageH}] /Resources << /XObject << /Im0 4 0 R >> >> /Contents 5 0 R >>`);
  object(4, `<< /Type /XObject /Subtype /Image /Width ${width} /Height ${height} /ColorSpace /DeviceRGB /BitsPerComponent 8 /Filter /DCTDecode /Length ${jpeg.length} >>`, jpeg);
  const contentBytes = ascii(content);
  object(5, `<< /Length ${contentBytes.length} >>`, contentBytes);
  const xref = length;
  const rows = offsets.slice(1).map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('');
  put(ascii(`xref\n0 6\n0000000000 65535 f \n${rows}trailer\n<< /Size 6 /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`));
  const out = new Uint8Array(length);
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}
