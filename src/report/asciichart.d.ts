// Local typings for the parts of the `asciichart` package that ringdown uses.
declare module 'asciichart' {
  interface PlotConfig {
    min?: number;
    max?: number;
    height?: number;
    offset?: number;
    padding?: string;
    colors?: string[];
    symbols?: string[];
    format?: (value: number, row: number) => string;
  }
  const asciichart: {
    plot(series: number[] | number[][], config?: PlotConfig): string;
    colored(char: string, color?: string): string;
    black: string;
    red: string;
    green: string;
    yellow: string;
    blue: string;
    magenta: string;
    cyan: string;
    lightgray: string;
    default: string;
    darkgray: string;
    reset: string;
  };
  export default asciichart;
}
