import { Component, type ReactNode } from 'react';

interface Props {
  /** Shown instead of the children when they fail to render (a chunk that did not load, a chart error). */
  fallback: ReactNode;
  children: ReactNode;
}

/** Keeps a failing optional part (a chart) from taking the whole page with it. */
export class FallbackBoundary extends Component<Props, { failed: boolean }> {
  override state = { failed: false };
  static getDerivedStateFromError() {
    return { failed: true };
  }
  override render() {
    return this.state.failed ? this.props.fallback : this.props.children;
  }
}
