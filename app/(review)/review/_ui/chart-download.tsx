'use client';

function save(blob: Blob, name: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function svgText(id: string): { text: string; width: number; height: number } | null {
  const el = document.getElementById(id);
  if (!(el instanceof SVGSVGElement)) return null;
  const clone = el.cloneNode(true) as SVGSVGElement;
  clone.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  const vb = el.viewBox.baseVal;
  return { text: new XMLSerializer().serializeToString(clone), width: vb?.width || el.clientWidth, height: vb?.height || el.clientHeight };
}

/** Downloads the chart `targetId` (an inline, self-styled <svg>) as SVG, or as PNG drawn on a canvas. */
export function ChartDownload({ targetId, fileName }: { targetId: string; fileName: string }) {
  const asSvg = () => {
    const s = svgText(targetId);
    if (s) save(new Blob([s.text], { type: 'image/svg+xml' }), `${fileName}.svg`);
  };
  const asPng = () => {
    const s = svgText(targetId);
    if (!s) return;
    const img = new Image();
    img.onload = () => {
      const scale = 2;
      const canvas = document.createElement('canvas');
      canvas.width = s.width * scale;
      canvas.height = s.height * scale;
      const ctx = canvas.getContext('2d');
      if (!ctx) return;
      ctx.scale(scale, scale);
      ctx.drawImage(img, 0, 0, s.width, s.height);
      canvas.toBlob((b) => b && save(b, `${fileName}.png`), 'image/png');
    };
    img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(s.text)}`;
  };
  return (
    <span className="chart-download">
      <button type="button" className="small-button" onClick={asSvg} data-testid={`svg-${targetId}`}>SVG</button>
      <button type="button" className="small-button" onClick={asPng}>PNG</button>
    </span>
  );
}
