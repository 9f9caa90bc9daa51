import { Component, type ReactNode } from "react";

/** Keeps the editor usable when an embedded view fails (a lost WebGL context, a chunk that did not load). */
export class PanelErrorBoundary extends Component<{ fallback: (error: Error) => ReactNode; children: ReactNode }, { error: Error | null }> {
  override state: { error: Error | null } = { error: null };
  static getDerivedStateFromError(error: Error) {
    return { error };
  }
  override render() {
    return this.state.error ? this.props.fallback(this.state.error) : this.props.children;
  }
}
