declare module 'monotone-convex-hull-2d' {
  /** Indices of the convex hull corners of a 2-D point set. */
  export default function monotoneConvexHull2D(points: number[][]): number[];
}
