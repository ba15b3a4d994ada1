import fs from 'node:fs';
import path from 'node:path';
import { projectPath } from '../paths';
import Mustache from 'mustache';
import { z } from 'zod';

// The documents' wording and section order live in templates/pdf/<name>.json; the code only draws. A layout
// names its sections in order (each renderer knows a fixed set of section ids), the fixed wording with
// {{placeholders}}, the labels, and word lists such as severities or outcomes.

const TEMPLATES_DIR = projectPath('templates', 'pdf');

const sectionSchema = z.strictObject({
  id: z.string().regex(/^[a-z_]+$/),
  heading: z.string().optional(),
  title: z.string().optional(),
  text: z.string().optional(),
});

const layoutSchema = z.strictObject({
  title: z.string().min(1),
  footer: z.string().min(1),
  sections: z.array(sectionSchema).min(1),
  labels: z.record(z.string(), z.string()),
  words: z.record(z.string(), z.record(z.string(), z.string())),
});

export type Section = z.infer<typeof sectionSchema>;

export class Layout {
  constructor(
    readonly name: string,
    private readonly raw: z.infer<typeof layoutSchema>,
  ) {}

  get title() {
    return this.raw.title;
  }

  /** The sections in the template's order, each checked against the ids the renderer knows. */
  sections<Id extends string>(known: readonly Id[]): (Section & { id: Id })[] {
    for (const s of this.raw.sections) {
      if (!known.includes(s.id as Id))
        throw new Error(`templates/pdf/${this.name}.json: unknown section "${s.id}"`);
    }
    return this.raw.sections as (Section & { id: Id })[];
  }

  label(key: string): string {
    const v = this.raw.labels[key];
    if (v === undefined) throw new Error(`templates/pdf/${this.name}.json: no label "${key}"`);
    return v;
  }

  word(list: string, key: string): string {
    const v = this.raw.words[list]?.[key];
    if (v === undefined) throw new Error(`templates/pdf/${this.name}.json: no word "${list}.${key}"`);
    return v;
  }

  /** Fills {{placeholders}}; documents are not HTML, so nothing is escaped. */
  fill(template: string, view: Record<string, unknown>): string {
    return Mustache.render(template, view, {}, { escape: (s: string) => s });
  }

  footer(view: Record<string, unknown>) {
    return this.fill(this.raw.footer, view);
  }
}

const cache = new Map<string, Layout>();

export function loadLayout(name: 'determination-letter' | 'packing-slip' | 'credit-memo'): Layout {
  let layout = cache.get(name);
  if (!layout) {
    const file = path.join(TEMPLATES_DIR, `${name}.json`);
    layout = new Layout(name, layoutSchema.parse(JSON.parse(fs.readFileSync(file, 'utf8'))));
    cache.set(name, layout);
  }
  return layout;
}
