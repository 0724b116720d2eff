// Typed loads and stores at element indices of arrays laid out in the instance's memory (byte offsets),
// shared by the WebAssembly kernels. Inlined where used.

@inline export function f64At(base: usize, i: i32): f64 {
  return load<f64>(base + (<usize>i << 3));
}
@inline export function setF64(base: usize, i: i32, v: f64): void {
  store<f64>(base + (<usize>i << 3), v);
}
@inline export function i32At(base: usize, i: i32): i32 {
  return load<i32>(base + (<usize>i << 2));
}
@inline export function setI32(base: usize, i: i32, v: i32): void {
  store<i32>(base + (<usize>i << 2), v);
}
