"use client";

import { Eraser } from "lucide-react";
import { forwardRef, useCallback, useEffect, useImperativeHandle, useRef, useState } from "react";
import { Button } from "@/components/ui/button";

// A signature box for a finger or a stylus: pointer events on a canvas, drawn at the screen's
// pixel density, exported as a PNG on a white background (what the stop's proof of delivery keeps).

export interface SignaturePadHandle {
  /** The signature as a PNG data URL, or null while nothing is drawn. */
  toPng(): string | null;
  clear(): void;
}

const INK = "#0f2530";

export const SignaturePad = forwardRef<SignaturePadHandle, { onChange?: (signed: boolean) => void; label?: string }>(function SignaturePad(
  { onChange, label = "Receiver's signature" },
  ref,
) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const last = useRef<{ x: number; y: number } | null>(null);
  const [signed, setSigned] = useState(false);
  const length = useRef(0);

  const paintBackground = useCallback(() => {
    const c = canvas.current;
    if (!c) return;
    const ctx = c.getContext("2d")!;
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.fillStyle = "#ffffff";
    ctx.fillRect(0, 0, c.width, c.height);
    const ratio = c.width / c.clientWidth || 1;
    ctx.setTransform(ratio, 0, 0, ratio, 0, 0);
    ctx.strokeStyle = INK;
    ctx.lineWidth = 2.4;
    ctx.lineCap = "round";
    ctx.lineJoin = "round";
  }, []);

  const clear = useCallback(() => {
    paintBackground();
    length.current = 0;
    setSigned(false);
    onChange?.(false);
  }, [onChange, paintBackground]);

  useEffect(() => {
    const c = canvas.current;
    if (!c) return;
    const ratio = Math.max(1, Math.min(3, window.devicePixelRatio || 1));
    c.width = Math.round(c.clientWidth * ratio);
    c.height = Math.round(c.clientHeight * ratio);
    paintBackground();
  }, [paintBackground]);

  useImperativeHandle(ref, () => ({ toPng: () => (signed && canvas.current ? canvas.current.toDataURL("image/png") : null), clear }), [signed, clear]);

  const point = (e: React.PointerEvent<HTMLCanvasElement>) => {
    const box = e.currentTarget.getBoundingClientRect();
    return { x: e.clientX - box.left, y: e.clientY - box.top };
  };

  const down = (e: React.PointerEvent<HTMLCanvasElement>) => {
    e.preventDefault();
    e.currentTarget.setPointerCapture?.(e.pointerId);
    last.current = point(e);
    const ctx = e.currentTarget.getContext("2d")!;
    ctx.beginPath();
    ctx.arc(last.current.x, last.current.y, 1.2, 0, Math.PI * 2);
    ctx.fillStyle = INK;
    ctx.fill();
  };
  const move = (e: React.PointerEvent<HTMLCanvasElement>) => {
    if (!last.current) return;
    const p = point(e);
    const ctx = e.currentTarget.getContext("2d")!;
    ctx.beginPath();
    ctx.moveTo(last.current.x, last.current.y);
    ctx.lineTo(p.x, p.y);
    ctx.stroke();
    length.current += Math.hypot(p.x - last.current.x, p.y - last.current.y);
    last.current = p;
    // A tap or a dot is not a signature: a few centimetres of line are.
    if (!signed && length.current > 40) {
      setSigned(true);
      onChange?.(true);
    }
  };
  const up = () => {
    last.current = null;
  };

  return (
    <div className="space-y-2">
      <div className="flex items-center justify-between">
        <span id="signature-label" className="text-sm font-medium text-ink">
          {label}
        </span>
        <Button variant="ghost" size="sm" onClick={clear} disabled={!signed && length.current === 0}>
          <Eraser className="h-4 w-4" aria-hidden="true" /> Clear
        </Button>
      </div>
      <canvas
        ref={canvas}
        role="img"
        aria-labelledby="signature-label"
        data-testid="signature-pad"
        data-signed={signed ? "yes" : "no"}
        className="h-44 w-full touch-none rounded-lg border-2 border-dashed border-line-strong bg-white"
        onPointerDown={down}
        onPointerMove={move}
        onPointerUp={up}
        onPointerCancel={up}
        onPointerLeave={up}
      />
      <p className="text-xs text-muted">{signed ? "Signed. Clear it to sign again." : "Ask the receiver to sign in the box with a finger."}</p>
    </div>
  );
});
