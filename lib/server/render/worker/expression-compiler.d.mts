/** Types of expression-compiler.mjs: the vega.View `expr` option (same interface as vega-interpreter's). */
type Ctx = { functions: object };
type Ast = { ast: unknown };

export declare const compiledExpressions: {
  operator(ctx: Ctx, expr: Ast): (params: unknown) => unknown;
  parameter(ctx: Ctx, expr: Ast): (datum: unknown, params: unknown) => unknown;
  event(ctx: Ctx, expr: Ast): (event: unknown) => unknown;
  handler(ctx: Ctx, expr: Ast): (params: unknown, event: { item?: { datum?: unknown } }) => unknown;
  encode(ctx: Ctx, encode: { marktype: string; channels: Record<string, Ast> }): (item: Record<string, unknown>, params: unknown) => number;
};
