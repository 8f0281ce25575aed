'use client';

export default function GlobalError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: 'system-ui', padding: 40 }}>
        <h2>Veilmeter could not load this page</h2>
        <p>Try again in a moment.</p>
        <button onClick={reset}>Try again</button>
      </body>
    </html>
  );
}
