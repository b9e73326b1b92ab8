/** Disjoint sets over node names: the connectivity questions in topology all reduce to this. */
export class UnionFind {
  private readonly parent = new Map<string, string>();

  find(x: string): string {
    let root = this.parent.get(x) ?? x;
    if (root === x) {
      this.parent.set(x, x);
      return x;
    }
    root = this.find(root);
    this.parent.set(x, root);
    return root;
  }

  /** Joins the two sets; returns false if they were already one. */
  union(a: string, b: string): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    this.parent.set(ra, rb);
    return true;
  }

  connected(a: string, b: string): boolean {
    return this.find(a) === this.find(b);
  }
}
