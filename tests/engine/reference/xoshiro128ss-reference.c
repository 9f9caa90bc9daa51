/* Produces the reference output that tests/engine/random.test.ts checks against.
   next() and splitmix64 are the generators exactly as published by their authors
   (D. Blackman and S. Vigna, xoshiro128** 1.1 and splitmix64, public domain / CC0).
   Build and run: gcc -O2 -o /tmp/xref xoshiro128ss-reference.c && /tmp/xref */
#include <stdint.h>
#include <stdio.h>

static inline uint32_t rotl(const uint32_t x, int k) { return (x << k) | (x >> (32 - k)); }
static uint32_t s[4];

uint32_t next(void) {
	const uint32_t result = rotl(s[1] * 5, 7) * 9;
	const uint32_t t = s[1] << 9;
	s[2] ^= s[0];
	s[3] ^= s[1];
	s[1] ^= s[2];
	s[0] ^= s[3];
	s[2] ^= t;
	s[3] = rotl(s[3], 11);
	return result;
}

void jump(void) {
	static const uint32_t JUMP[] = { 0x8764000b, 0xf542d2d3, 0x6fa035c3, 0x77f2db5b };
	uint32_t s0 = 0, s1 = 0, s2 = 0, s3 = 0;
	for (int i = 0; i < 4; i++)
		for (int b = 0; b < 32; b++) {
			if (JUMP[i] & UINT32_C(1) << b) { s0 ^= s[0]; s1 ^= s[1]; s2 ^= s[2]; s3 ^= s[3]; }
			next();
		}
	s[0] = s0; s[1] = s1; s[2] = s2; s[3] = s3;
}

static uint64_t x;
uint64_t splitmix64_next(void) {
	uint64_t z = (x += 0x9e3779b97f4a7c15);
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9;
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb;
	return z ^ (z >> 31);
}

int main(void) {
	s[0] = 1; s[1] = 2; s[2] = 3; s[3] = 4;
	printf("xoshiro128** from {1,2,3,4}:");
	for (int i = 0; i < 10; i++) printf(" %u", next());
	printf("\nafter 10 more draws and jump():");
	for (int i = 0; i < 10; i++) next();
	jump();
	for (int i = 0; i < 5; i++) printf(" %u", next());
	x = 1234567;
	printf("\nsplitmix64 from 1234567:");
	for (int i = 0; i < 5; i++) printf(" %llu", (unsigned long long)splitmix64_next());
	x = 0;
	printf("\nsplitmix64 from 0:");
	for (int i = 0; i < 3; i++) printf(" %llu", (unsigned long long)splitmix64_next());
	printf("\n");
	return 0;
}
