export async function main(argv: string[]): Promise<number> {
  console.log('sunfacet', argv.join(' '));
  return 0;
}
