"use client";

import { useEffect, useRef, useState } from "react";
import { codeFromScan } from "@/lib/block-code";
import { Button } from "@/components/ui/button";

// The Barcode Detection API is not in TypeScript's DOM library yet; this is the part we use.
interface DetectedBarcode {
  rawValue: string;
}
interface BarcodeDetectorLike {
  detect(source: HTMLVideoElement): Promise<DetectedBarcode[]>;
}
type BarcodeDetectorCtor = new (opts?: { formats?: string[] }) => BarcodeDetectorLike;

type Support = "checking" | "ready" | "no-detector" | "no-camera" | "insecure";

function detectSupport(): Support {
  if (typeof window === "undefined") return "checking";
  if (!window.isSecureContext) return "insecure";
  if (!("BarcodeDetector" in window)) return "no-detector";
  if (!navigator.mediaDevices?.getUserMedia) return "no-camera";
  return "ready";
}

const WHY: Record<Exclude<Support, "checking" | "ready">, string> = {
  insecure: "Scanning with the camera needs a secure (https) connection to Blockyard.",
  "no-detector": "This browser cannot read QR codes from the camera.",
  "no-camera": "This browser gives no access to a camera.",
};

/**
 * Reads a block label's QR code with the tablet's back camera (the browser's BarcodeDetector),
 * and says plainly when that is not possible so the person types the code instead.
 */
export function QrScanner({ onCode }: { onCode: (code: string) => void }) {
  const [support, setSupport] = useState<Support>("checking");
  const [open, setOpen] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const videoRef = useRef<HTMLVideoElement>(null);
  const streamRef = useRef<MediaStream | null>(null);

  useEffect(() => setSupport(detectSupport()), []);

  const stop = () => {
    streamRef.current?.getTracks().forEach((t) => t.stop());
    streamRef.current = null;
    setOpen(false);
  };

  // biome-ignore lint/correctness/useExhaustiveDependencies: the camera starts and stops with `open` only
  useEffect(() => {
    if (!open) return;
    let cancelled = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    (async () => {
      try {
        const stream = await navigator.mediaDevices.getUserMedia({
          video: { facingMode: { ideal: "environment" } },
          audio: false,
        });
        if (cancelled) return stream.getTracks().forEach((t) => t.stop());
        streamRef.current = stream;
        const video = videoRef.current!;
        video.srcObject = stream;
        await video.play();
        const Detector = (window as unknown as { BarcodeDetector: BarcodeDetectorCtor }).BarcodeDetector;
        const detector = new Detector({ formats: ["qr_code"] });
        const tick = async () => {
          if (cancelled) return;
          try {
            const found = await detector.detect(video);
            for (const f of found) {
              const code = codeFromScan(f.rawValue);
              if (code) {
                stop();
                onCode(code);
                return;
              }
              setMessage("That QR code is not a Blockyard label.");
            }
          } catch {
            /* a frame that could not be read; try the next one */
          }
          timer = setTimeout(tick, 200);
        };
        void tick();
      } catch (e) {
        const denied = (e as { name?: string }).name === "NotAllowedError";
        setMessage(
          denied
            ? "The camera was not allowed. Type the code from the label instead."
            : "The camera could not be started. Type the code from the label instead.",
        );
        stop();
      }
    })();
    return () => {
      cancelled = true;
      if (timer) clearTimeout(timer);
      streamRef.current?.getTracks().forEach((t) => t.stop());
      streamRef.current = null;
    };
    // onCode is a fresh function each render; the scan loop only needs the one it started with.
  }, [open]);

  if (support === "checking") return null;
  if (support !== "ready") {
    return (
      <p className="text-sm text-ink-faint" data-testid="scan-unavailable">
        {WHY[support]} Type the code printed under the QR code instead.
      </p>
    );
  }
  return (
    <div className="space-y-2">
      {!open ? (
        <Button tone="secondary" onClick={() => (setMessage(null), setOpen(true))}>
          <CameraIcon /> Scan the label
        </Button>
      ) : (
        <div className="space-y-2">
          <div className="relative overflow-hidden rounded-card border border-bead-strong bg-ink">
            <video ref={videoRef} className="aspect-[4/3] w-full max-w-md object-cover" playsInline muted />
            <div aria-hidden className="pointer-events-none absolute inset-[18%] rounded-lg border-2 border-white/80" />
          </div>
          <p className="text-sm text-ink-soft">Hold the label&apos;s QR code inside the frame.</p>
          <Button tone="quiet" onClick={stop}>
            Stop the camera
          </Button>
        </div>
      )}
      {message && (
        <p className="text-sm text-ember" role="alert">
          {message}
        </p>
      )}
    </div>
  );
}

function CameraIcon() {
  return (
    <svg
      aria-hidden
      viewBox="0 0 24 24"
      className="size-5"
      fill="none"
      stroke="currentColor"
      strokeWidth="1.8"
      strokeLinecap="round"
      strokeLinejoin="round"
    >
      <path d="M4 8h3l1.5-2h7L17 8h3v11H4z" />
      <circle cx="12" cy="13" r="3.5" />
    </svg>
  );
}
