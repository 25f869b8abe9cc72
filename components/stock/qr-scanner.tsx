"use client";

import { useEffect, useRef, useState, type ChangeEvent } from "react";
import { codeFromScan } from "@/lib/block-code";
import { Button, buttonClass } from "@/components/ui/button";
import { LiveNotice } from "@/components/ui/result-notice";
import type { QrRead } from "@/lib/qr-decode";

// The Barcode Detection API is not in TypeScript's DOM library yet; this is the part we use.
interface DetectedBarcode {
  rawValue: string;
}
interface BarcodeDetectorLike {
  detect(source: CanvasImageSource | ImageBitmap): Promise<DetectedBarcode[]>;
}
type BarcodeDetectorCtor = (new (opts?: {
  formats?: string[];
}) => BarcodeDetectorLike) & {
  getSupportedFormats?: () => Promise<string[]>;
};

/** The browser's own QR reader when it has one that reads QR codes (Chrome on Android, Safari 17+), else null. */
async function nativeDetector(): Promise<BarcodeDetectorLike | null> {
  const Ctor = (window as unknown as { BarcodeDetector?: BarcodeDetectorCtor }).BarcodeDetector;
  if (!Ctor) return null;
  try {
    const formats = (await Ctor.getSupportedFormats?.()) ?? ["qr_code"];
    return formats.includes("qr_code") ? new Ctor({ formats: ["qr_code"] }) : null;
  } catch {
    return null;
  }
}

/** jsQR and the pure decoding around it, loaded only when a browser without a detector needs them. */
const decoder = () => import("@/lib/qr-decode");

/** What a decoded text means: a block code, another QR code, or nothing. */
function readText(text: string | undefined): QrRead {
  if (text === undefined) return { kind: "none" };
  const code = codeFromScan(text);
  return code ? { kind: "code", code, text } : { kind: "other", text };
}

/** Reads a QR code from a photo: the browser's detector first, then jsQR at a few sizes. */
async function readPhoto(file: File): Promise<QrRead> {
  const bitmap = await createImageBitmap(file);
  try {
    const native = await nativeDetector();
    if (native) {
      const found = await native.detect(bitmap).catch(() => []);
      const read = readText(found[0]?.rawValue);
      if (read.kind !== "none") return read;
    }
    const { PHOTO_SIDES, fitWithin, readLabelQr } = await decoder();
    const canvas = document.createElement("canvas");
    const ctx = canvas.getContext("2d", { willReadFrequently: true });
    if (!ctx) return { kind: "none" };
    const longest = Math.max(bitmap.width, bitmap.height);
    for (const side of PHOTO_SIDES) {
      const { width, height } = fitWithin(bitmap.width, bitmap.height, side);
      canvas.width = width;
      canvas.height = height;
      ctx.drawImage(bitmap, 0, 0, width, height);
      const read = readLabelQr(ctx.getImageData(0, 0, width, height), { thorough: true });
      if (read.kind !== "none" || side >= longest) return read;
    }
    return { kind: "none" };
  } finally {
    bitmap.close();
  }
}

type Camera = "checking" | "ready" | "insecure" | "no-camera";

async function detectCamera(): Promise<Camera> {
  if (!window.isSecureContext) return "insecure";
  const media = navigator.mediaDevices;
  if (!media?.getUserMedia) return "no-camera";
  try {
    // Before permission the devices have no names, but a camera is listed as a videoinput.
    const devices = await media.enumerateDevices();
    if (!devices.some((d) => d.kind === "videoinput")) return "no-camera";
  } catch {
    /* cannot tell: offer the camera and say so if it fails */
  }
  return "ready";
}

const WHY: Record<Exclude<Camera, "checking" | "ready">, string> = {
  insecure: "Scanning live with the camera needs a secure (https) connection to Blockyard.",
  "no-camera": "This browser shows no camera to scan with live.",
};

const NOT_A_LABEL = "That QR code is not a Blockyard label.";

/**
 * Reads a block label's QR code, on any browser: live from the tablet's back camera (the browser's
 * BarcodeDetector where it has one, else jsQR on the video frames), or from a photo of the label
 * (taken there and then, or picked), which works even without a secure connection. Says plainly
 * when a photo holds no code, so the person can try again or type the code.
 */
export function QrScanner({ onCode }: { onCode: (code: string) => void }) {
  const [camera, setCamera] = useState<Camera>("checking");
  const [open, setOpen] = useState(false);
  const [reading, setReading] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const videoRef = useRef<HTMLVideoElement>(null);
  const streamRef = useRef<MediaStream | null>(null);

  useEffect(() => {
    let live = true;
    void detectCamera().then((c) => live && setCamera(c));
    return () => {
      live = false;
    };
  }, []);

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
        const native = await nativeDetector();
        const fallback = native ? null : await decoder();
        const canvas = document.createElement("canvas");
        const ctx = canvas.getContext("2d", { willReadFrequently: true });
        const frame = async (): Promise<QrRead> => {
          if (native) return readText((await native.detect(video))[0]?.rawValue);
          if (!fallback || !ctx || !video.videoWidth) return { kind: "none" };
          // A smaller copy of the frame: quick enough to try five times a second on a tablet.
          const { width, height } = fallback.fitWithin(video.videoWidth, video.videoHeight, 800);
          canvas.width = width;
          canvas.height = height;
          ctx.drawImage(video, 0, 0, width, height);
          return fallback.readLabelQr(ctx.getImageData(0, 0, width, height));
        };
        const tick = async () => {
          if (cancelled) return;
          try {
            const read = await frame();
            if (read.kind === "code") {
              stop();
              onCode(read.code);
              return;
            }
            if (read.kind === "other") setMessage(NOT_A_LABEL);
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
            ? "The camera was not allowed. Take a photo of the label, or type the code from it."
            : "The camera could not be started. Take a photo of the label, or type the code from it.",
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

  const photo = async (e: ChangeEvent<HTMLInputElement>) => {
    const file = e.target.files?.[0];
    e.target.value = ""; // the same photo chosen again is read again
    if (!file) return;
    setMessage(null);
    if (file.type && !file.type.startsWith("image/")) return setMessage(`"${file.name}" is not a photo.`);
    setReading(true);
    try {
      const read = await readPhoto(file);
      if (read.kind === "code") return onCode(read.code);
      setMessage(
        read.kind === "other"
          ? NOT_A_LABEL
          : "No QR code could be read in that photo. Take it again closer to the label, with the whole code in the picture, or type the code.",
      );
    } catch {
      setMessage(`"${file.name}" could not be opened as a picture. Take the photo again, or type the code.`);
    } finally {
      setReading(false);
    }
  };

  if (camera === "checking") return null;
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap gap-2">
        {camera === "ready" && !open && (
          <Button tone="secondary" onClick={() => (setMessage(null), setOpen(true))}>
            <CameraIcon /> Scan with the camera
          </Button>
        )}
        <label
          className={buttonClass(
            "secondary",
            `relative cursor-pointer overflow-hidden focus-within:outline-2 focus-within:outline-offset-2 focus-within:outline-kerf ${reading ? "opacity-70" : ""}`,
          )}
        >
          <PhotoIcon /> {reading ? "Reading the photo…" : "Take a photo of the label"}
          <input
            type="file"
            accept="image/*"
            capture="environment"
            disabled={reading}
            onChange={photo}
            className="absolute inset-0 cursor-pointer opacity-0"
          />
        </label>
      </div>
      {open && (
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
      {camera !== "ready" && (
        <p className="text-sm text-ink-soft" data-testid="scan-unavailable">
          {WHY[camera]} Take a photo of the label instead, or type the code printed under the QR code.
        </p>
      )}
      {message && <LiveNotice tone="danger">{message}</LiveNotice>}
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

function PhotoIcon() {
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
      <rect x="3.5" y="5" width="17" height="14" rx="2" />
      <circle cx="9" cy="10" r="1.8" />
      <path d="M20.5 16l-5-5-8.5 8" />
    </svg>
  );
}
