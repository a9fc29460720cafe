/**
 * An SVG document drawn as PNG bytes in the page: the SVG loaded in an <img> from a blob URL,
 * drawn onto a canvas `scale` times its size, and encoded with canvas.toBlob('image/png')
 * (the HTML canvas's own encoder).
 */
export async function svgToPng(svg: string, scale = 2): Promise<Uint8Array> {
  const size = /<svg[^>]*\swidth="([\d.]+)"[^>]*\sheight="([\d.]+)"/.exec(svg);
  const w = size ? Number(size[1]) : 0;
  const h = size ? Number(size[2]) : 0;
  if (!(w > 0 && h > 0)) throw new Error('The diagram has no size to draw.');
  const url = URL.createObjectURL(new Blob([svg], { type: 'image/svg+xml' }));
  try {
    const img = new Image();
    await new Promise<void>((resolve, reject) => {
      img.onload = () => resolve();
      img.onerror = () => reject(new Error('The diagram could not be drawn as an image.'));
      img.src = url;
    });
    const canvas = document.createElement('canvas');
    canvas.width = Math.round(w * scale);
    canvas.height = Math.round(h * scale);
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('This window cannot draw images (no 2D canvas).');
    ctx.scale(scale, scale);
    ctx.drawImage(img, 0, 0, w, h);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/png'));
    if (!blob) throw new Error('The image could not be encoded as PNG.');
    return new Uint8Array(await blob.arrayBuffer());
  } finally {
    URL.revokeObjectURL(url);
  }
}
