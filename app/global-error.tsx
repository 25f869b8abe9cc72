"use client";

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en">
      <body
        style={{
          fontFamily: "system-ui, sans-serif",
          background: "#f7f5ef",
          color: "#1c2a2e",
          padding: "3rem",
          textAlign: "center",
        }}
      >
        <h1>Blockyard stopped short</h1>
        <p>The page could not be shown. Nothing you saved was lost.</p>
        <button
          type="button"
          onClick={reset}
          style={{ padding: "0.6rem 1rem", background: "#1f6c75", color: "white", border: 0, borderRadius: 6 }}
        >
          Try again
        </button>
      </body>
    </html>
  );
}
