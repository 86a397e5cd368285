// How the saved forecast page hands its island the forecast's text (savedForecastToJson) without
// making it an island prop: Astro writes every prop into the page's HTML escaped as an attribute
// (each quote six characters) and hashes the whole of it for the island's id, on every render.
// Instead the page writes the text once into a <template> beside the island (kept escaped per
// process, see forecastPageText), and the island finds it:
// - on the server under a symbol key of its `pageText` prop. Astro sends only an object's string
//   keys to the browser, so the prop arrives there as `{}` and the text is not written twice;
// - in the browser in that template, which the page places before the island.

const TEXT = Symbol.for('sunreckon.forecastPageText');

/** The island prop that carries the page's text on the server. */
export type PageTextRef = { [TEXT]?: string };

/** The prop for the page to pass (server only). */
export function pageTextRef(text: string): PageTextRef {
  return { [TEXT]: text };
}

/** The id of the template holding the text of the saved forecast `id`. */
export function pageTextId(id: string): string {
  return `forecast-data-${id}`;
}

/** The page's text: from the prop on the server, from the page's template in the browser. */
export function readPageText(ref: PageTextRef | undefined, id: string): string | undefined {
  const given = ref?.[TEXT];
  if (typeof given === 'string') return given;
  if (typeof document === 'undefined') return undefined;
  const el = document.getElementById(pageTextId(id));
  return el instanceof HTMLTemplateElement ? (el.content.textContent ?? undefined) : undefined;
}
