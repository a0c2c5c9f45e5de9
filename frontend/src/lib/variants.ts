import { cn } from './cn';

type VariantConfig = Record<string, Record<string, string>>;
export type VariantProps<C extends VariantConfig> = { [K in keyof C]?: keyof C[K] };

/**
 * Declares a component's variants once (base classes, one class list per option, defaults) and returns
 * a function that builds the class string; a `className` passed last wins over the variant classes.
 */
export function variants<C extends VariantConfig>(base: string, config: C, defaults: { [K in keyof C]: keyof C[K] }) {
  return (props: VariantProps<C> & { className?: string } = {}): string =>
    cn(base, ...Object.keys(config).map((key) => config[key][String(props[key as keyof C] ?? defaults[key as keyof C])]), props.className);
}
