// The names the compiled MDX expects in scope (mdx-bundler's globals), shared by server and browser.
import * as React from "react";
import * as ReactDOM from "react-dom";
import * as jsxRuntime from "react/jsx-runtime";

export const LESSON_SCOPE_NAMES = ["React", "ReactDOM", "_jsx_runtime"] as const;
export const lessonScopeValues = () => [React, ReactDOM, jsxRuntime];

export type LessonFactory = (...scope: unknown[]) => { default: React.ComponentType<{ components?: Record<string, unknown> }> };

declare global {
  // eslint-disable-next-line no-var
  var __bendwiseLessons: Record<string, LessonFactory> | undefined;
}

/** Loads a lesson's script in the browser (client-side navigation); resolves once it has registered. */
export function loadLessonScript(url: string, hash: string): Promise<void> {
  if (typeof window === "undefined" || globalThis.__bendwiseLessons?.[hash]) return Promise.resolve();
  return new Promise((resolve, reject) => {
    const script = document.createElement("script");
    script.src = url;
    script.onload = () => resolve();
    script.onerror = () => reject(new Error("The lesson could not be loaded. Check your connection and reload the page."));
    document.head.appendChild(script);
  });
}

const components = new Map<string, React.ComponentType<{ components?: Record<string, unknown> }>>();

/**
 * The lesson's React component, from the factory registered under its hash: in the browser by the
 * lesson's script, on the server by the lesson route's loader. Made once per hash, so React keeps
 * the same component type across renders.
 */
export function lessonComponent(hash: string) {
  const known = components.get(hash);
  if (known) return known;
  const factory = globalThis.__bendwiseLessons?.[hash];
  if (!factory) return null;
  const component = factory(...lessonScopeValues()).default;
  components.set(hash, component);
  return component;
}

/** Registers a lesson factory on the server (the browser registers through the script). */
export function registerLessonFactory(hash: string, factory: LessonFactory) {
  globalThis.__bendwiseLessons ??= {};
  globalThis.__bendwiseLessons[hash] ??= factory;
}
