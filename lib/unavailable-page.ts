import { DATABASE_UNAVAILABLE_MESSAGE } from "./errors";

/**
 * The page shown, with a 503, when the database does not answer: whole in itself (no
 * scripts, no stylesheet to fetch), calm, and saying what is wrong and what to do.
 */
export function unavailablePage(options: { nonce?: string } = {}): string {
  const nonce = options.nonce ? ` nonce="${options.nonce}"` : "";
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="refresh" content="30">
<title>Cloche can’t reach its database · Cloche</title>
<style${nonce}>
  body { margin: 0; min-height: 100dvh; display: flex; align-items: center; justify-content: center; font-family: system-ui, sans-serif; background: #f6f8f4; color: #1d2a1a; }
  main { max-width: 28rem; margin: 1.5rem; padding: 2rem 1.5rem; background: #fff; border: 1px solid #d5dccf; border-radius: 1rem; text-align: center; }
  h1 { font-size: 1.25rem; margin: 0 0 .75rem; }
  p { line-height: 1.5; margin: 0 0 .75rem; color: #3a4a35; }
  a { display: inline-block; margin-top: .5rem; padding: .75rem 1.25rem; min-height: 44px; box-sizing: border-box; border-radius: .75rem; background: #34562c; color: #fff; text-decoration: none; font-weight: 600; }
</style>
</head>
<body>
<main>
<h1>Cloche can’t reach its database</h1>
<p>${DATABASE_UNAVAILABLE_MESSAGE}</p>
<p>This page tries again by itself every 30 seconds.</p>
<a href="">Try again now</a>
</main>
</body>
</html>`;
}
