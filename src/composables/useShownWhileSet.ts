import { computed, type Ref, type WritableComputedRef } from 'vue'

/**
 * The `v-model` of a snackbar or dialog that shows a value while it is set (a message, a notice):
 * open while the value is not null; closing it clears the value.
 */
export function useShownWhileSet<T>(value: Ref<T | null>): WritableComputedRef<boolean> {
  return computed({
    get: () => value.value !== null,
    set: (open: boolean) => {
      if (!open) value.value = null
    },
  })
}
