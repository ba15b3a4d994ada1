import fs from 'node:fs';
import path from 'node:path';
import Mustache from 'mustache';
import { projectPath } from './paths';

const TEMPLATES_DIR = projectPath('templates');
const cache = new Map<string, string>();

function load(rel: string) {
  let t = cache.get(rel);
  if (t === undefined) {
    t = fs.readFileSync(path.join(TEMPLATES_DIR, rel), 'utf8');
    cache.set(rel, t);
  }
  return t;
}

/** Renders templates/email/<name>.{subject.txt,txt,html}; values are HTML-escaped in the HTML part only. */
export function renderEmail(name: string, view: Record<string, unknown>) {
  const layout = load('email/layout.html');
  const subject = Mustache.render(
    load(`email/${name}.subject.txt`),
    view,
    {},
    { escape: (s: string) => s },
  ).trim();
  const text = Mustache.render(load(`email/${name}.txt`), view, {}, { escape: (s: string) => s });
  const content = Mustache.render(load(`email/${name}.html`), view);
  const html = Mustache.render(layout, { ...view, subject }, { content });
  return { subject, text, html };
}
