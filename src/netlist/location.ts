/** A place in a source text: 1-based line and column, and the length of the marked span. */
export interface SourceLocation {
  file: string;
  line: number;
  col: number;
  length: number;
}
