import { Component, type ErrorInfo, type ReactNode } from "react";

type Props = {
  fallback: (error: unknown, reset: () => void) => ReactNode;
  onReset?: () => void;
  children: ReactNode;
};

type State = { error: unknown; failed: boolean };

export class ErrorBoundary extends Component<Props, State> {
  state: State = { error: null, failed: false };

  static getDerivedStateFromError(error: unknown): State {
    return { error, failed: true };
  }

  componentDidCatch(error: unknown, info: ErrorInfo): void {
    console.warn("A page region failed to render", error, info.componentStack);
  }

  reset = (): void => {
    this.props.onReset?.();
    this.setState({ error: null, failed: false });
  };

  render(): ReactNode {
    return this.state.failed ? this.props.fallback(this.state.error, this.reset) : this.props.children;
  }
}
