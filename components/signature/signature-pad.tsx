"use client";
// The stylus pad: draws with a pen, a finger or a mouse (pointer events), sized to its box so
// strokes land under the pen. The image is the mark on the record, never the signature itself.
import { forwardRef, useEffect, useImperativeHandle, useRef, useState } from "react";
import SignatureCanvas from "react-signature-canvas";
import { Button } from "@/components/ui/button";

export type PadHandle = { isEmpty(): boolean; toPng(): string; clear(): void };

export const SignaturePad = forwardRef<PadHandle, { label: string; onChange?: (empty: boolean) => void }>(
  function SignaturePad({ label, onChange }, ref) {
    const box = useRef<HTMLDivElement>(null);
    const pad = useRef<SignatureCanvas>(null);
    const [width, setWidth] = useState(0);

    useEffect(() => {
      const el = box.current;
      if (!el) return;
      const measure = () => setWidth(Math.floor(el.clientWidth));
      measure();
      const ro = new ResizeObserver(measure);
      ro.observe(el);
      return () => ro.disconnect();
    }, []);

    useImperativeHandle(ref, () => ({
      isEmpty: () => pad.current?.isEmpty() ?? true,
      // A white background so the mark prints and shows on the dim theme alike.
      toPng: () => pad.current?.getCanvas().toDataURL("image/png") ?? "",
      clear: () => {
        pad.current?.clear();
        onChange?.(true);
      },
    }));

    return (
      <div className="flex flex-col gap-2">
        <div ref={box} className="relative overflow-hidden rounded-xl border-2 border-dashed border-line bg-white">
          {width > 0 && (
            <SignatureCanvas
              ref={pad}
              penColor="#0b1a33"
              backgroundColor="#ffffff"
              minWidth={1.2}
              maxWidth={3.2}
              clearOnResize={false}
              onEnd={() => onChange?.(pad.current?.isEmpty() ?? true)}
              canvasProps={
                {
                  width,
                  height: 200,
                  "aria-label": label,
                  role: "img",
                  className: "block touch-none",
                  style: { width, height: 200 },
                } as React.CanvasHTMLAttributes<HTMLCanvasElement>
              }
            />
          )}
          <span
            aria-hidden
            className="pointer-events-none absolute bottom-8 left-6 right-6 border-b border-slate-400"
          />
          <span aria-hidden className="pointer-events-none absolute bottom-2 left-6 text-sm text-slate-500">
            Sign above the line with the stylus or a finger
          </span>
        </div>
        <Button
          onClick={() => {
            pad.current?.clear();
            onChange?.(true);
          }}
          className="self-start"
        >
          Clear the pad
        </Button>
      </div>
    );
  },
);
