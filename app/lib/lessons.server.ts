// The lesson pipeline. Each lesson is a folder lessons/<NN>-<slug>/ with index.mdx (frontmatter,
// prose, components), its data sets and its exercise generators (exercises.server.ts).
//
// mdx-bundler compiles a lesson once, keyed by a hash of the lesson's files and the compiler's and
// plugins' versions; the result is kept in memory and on disk (.cache/lessons), so a request never
// compiles. How the compiled code reaches the browser: see lesson-code.server.ts.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import matter from "gray-matter";
import { z } from "zod";
import type { LessonExercises } from "./exercises";
import { remarkEquations } from "./lesson-equations.server";

/** Bumped by hand when our own compile options change, so old cache entries are not used. */
const PIPELINE_REVISION = 3;

const lessonsDir = () => path.resolve(process.env.BENDWISE_LESSONS_DIR ?? path.join(process.cwd(), "lessons"));
const cacheDir = () => path.resolve(process.env.BENDWISE_LESSON_CACHE_DIR ?? path.join(process.cwd(), ".cache", "lessons"));

export const frontmatterSchema = z.object({
  title: z.string().min(1),
  summary: z.string().min(1),
  minutes: z.number().int().positive(),
  gradeBand: z.enum(["6-8", "9-10", "6-10"]),
  ngss: z.array(z.string().regex(/^(MS|HS)-[A-Z]+\d*-\d+$/)).min(1),
  practices: z.array(z.string()).min(1),
  materials: z.array(z.string()).default([]),
  safety: z.array(z.string()).default([]),
});
export type LessonFrontmatter = z.infer<typeof frontmatterSchema>;

export interface LessonSummary extends LessonFrontmatter {
  slug: string;
  /** 1, 2, 3… from the folder name */
  number: number;
}

export interface CompiledLesson {
  slug: string;
  hash: string;
  code: string;
  frontmatter: LessonFrontmatter;
}

// The generators are bundled into the server build by Vite (and found by vitest the same way).
const exerciseModules = import.meta.glob<{ lesson: LessonExercises }>("../../lessons/*/exercises.server.ts", {
  eager: true,
});

export function lessonExercises(slug: string): LessonExercises {
  const entry = Object.entries(exerciseModules).find(([file]) => file.split("/").at(-2) === slug);
  return entry?.[1].lesson ?? { exercises: [] };
}

let summaries: LessonSummary[] | undefined;

/** Every lesson in course order, from the folder names and frontmatter (read once per process). */
export function listLessons(): LessonSummary[] {
  if (summaries) return summaries;
  const dir = lessonsDir();
  const found: LessonSummary[] = [];
  for (const slug of lessonFolders()) {
    const checked = checkLessonFrontmatter(slug);
    // A lesson with broken frontmatter is left out of the course rather than breaking every page;
    // the lesson tests fail on it (see lessonFrontmatterProblems).
    if (checked.ok) found.push({ ...checked.frontmatter, slug, number: Number(slug.slice(0, 2)) });
    else console.error(`Lesson ${slug} is left out: ${checked.problems.join("; ")}`);
  }
  summaries = found;
  return summaries;
}

/** The lesson folders, in course order. */
export function lessonFolders(): string[] {
  const dir = lessonsDir();
  return readdirSync(dir)
    .filter((name) => /^\d{2}-[a-z0-9-]+$/.test(name) && existsSync(path.join(dir, name, "index.mdx")))
    .sort();
}

/** Reads and checks one lesson's frontmatter, naming every problem. */
export function checkLessonFrontmatter(
  slug: string,
): { ok: true; frontmatter: LessonFrontmatter } | { ok: false; problems: string[] } {
  try {
    const { data } = matter(readFileSync(path.join(lessonsDir(), slug, "index.mdx"), "utf8"));
    const result = frontmatterSchema.safeParse(data);
    if (result.success) return { ok: true, frontmatter: result.data };
    return { ok: false, problems: result.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`) };
  } catch (error) {
    return { ok: false, problems: [`the frontmatter cannot be read (${(error as Error).message})`] };
  }
}

export function findLesson(slug: string): LessonSummary | undefined {
  return listLessons().find((l) => l.slug === slug);
}

function compilerVersions(): string {
  const versionOf = (pkg: string) => {
    try {
      return JSON.parse(readFileSync(path.join(process.cwd(), "node_modules", pkg, "package.json"), "utf8")).version;
    } catch {
      return "unknown";
    }
  };
  return ["mdx-bundler", "esbuild", "remark-math", "rehype-katex", "katex"].map((p) => `${p}@${versionOf(p)}`).join(",");
}

const hashes = new Map<string, string>();

/**
 * A hash of every file of the lesson (except its generators, which never reach the bundle) and the
 * compiler. In production the files do not change under a running server, so it is worked out once;
 * elsewhere it is read afresh, so an edited lesson is recompiled on its next view.
 */
export function lessonHash(slug: string): string {
  const known = process.env.NODE_ENV === "production" ? hashes.get(slug) : undefined;
  if (known) return known;
  const hash = hashLessonFiles(slug);
  hashes.set(slug, hash);
  return hash;
}

function hashLessonFiles(slug: string): string {
  const dir = path.join(lessonsDir(), slug);
  const hash = createHash("sha256").update(`rev${PIPELINE_REVISION};${compilerVersions()}`);
  for (const name of readdirSync(dir).sort()) {
    const file = path.join(dir, name);
    if (!statSync(file).isFile() || name.endsWith(".server.ts")) continue;
    hash.update(name).update("\0").update(readFileSync(file)).update("\0");
  }
  return hash.digest("hex").slice(0, 20);
}

const memoryCache = new Map<string, CompiledLesson>();
const inFlight = new Map<string, Promise<CompiledLesson>>();
let compilations = 0;

/** How many times this process has run the MDX compiler (the cache test reads it). */
export function compileCount(): number {
  return compilations;
}

/** The compiled lesson, from memory, from disk, or compiled now (once, even under concurrent requests). */
export async function compiledLesson(slug: string): Promise<CompiledLesson> {
  const hash = lessonHash(slug);
  const key = `${slug}@${hash}`;
  const cached = memoryCache.get(key);
  if (cached) return cached;
  const diskFile = path.join(cacheDir(), `${slug}-${hash}.json`);
  if (existsSync(diskFile)) {
    const fromDisk = JSON.parse(readFileSync(diskFile, "utf8")) as CompiledLesson;
    memoryCache.set(key, fromDisk);
    return fromDisk;
  }
  let pending = inFlight.get(key);
  if (!pending) {
    pending = compile(slug, hash).finally(() => inFlight.delete(key));
    inFlight.set(key, pending);
  }
  const compiled = await pending;
  memoryCache.set(key, compiled);
  mkdirSync(cacheDir(), { recursive: true });
  writeFileSync(diskFile, JSON.stringify(compiled));
  return compiled;
}

async function compile(slug: string, hash: string): Promise<CompiledLesson> {
  compilations++;
  const dir = path.join(lessonsDir(), slug);
  const [{ bundleMDX }, { default: remarkMath }, { default: rehypeKatex }] = await Promise.all([
    import("mdx-bundler"),
    import("remark-math"),
    import("rehype-katex"),
  ]);
  const result = await bundleMDX({
    source: readFileSync(path.join(dir, "index.mdx"), "utf8"),
    cwd: dir,
    mdxOptions(options) {
      options.remarkPlugins = [...(options.remarkPlugins ?? []), remarkMath, remarkEquations];
      // KaTeX writes HTML for the eye and MathML for screen readers.
      options.rehypePlugins = [...(options.rehypePlugins ?? []), [rehypeKatex, { output: "htmlAndMathml" }]];
      return options;
    },
    esbuildOptions(options) {
      options.loader = { ...options.loader, ".csv": "text" };
      options.minify = true;
      return options;
    },
  });
  return { slug, hash, code: result.code, frontmatter: frontmatterSchema.parse(result.frontmatter) };
}
